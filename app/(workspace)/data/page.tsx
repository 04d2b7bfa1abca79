import type { Metadata } from "next";
import Link from "next/link";
import { requirePageUser } from "@/lib/auth/server";
import { can } from "@/lib/auth/roles";
import { listDatasets } from "@/lib/services/datasets";
import { listSites } from "@/lib/services/sites";
import { DatasetListQuerySchema } from "@/lib/validations/dataset";
import { Card } from "@/components/ui/card";
import { Forbidden } from "@/components/ui/forbidden";
import { PageHeader } from "@/components/ui/page-header";

export const metadata: Metadata = { title: "Data" };
export const dynamic = "force-dynamic";

const COLUMNS = [
  { key: "name", label: "Name" },
  { key: "eventCount", label: "Events" },
  { key: "timeStart", label: "Time span" },
  { key: "createdAt", label: "Created" },
] as const;

export default async function DataPage({ searchParams }: { searchParams: Promise<Record<string, string>> }) {
  const { user, forbidden } = await requirePageUser("datasets:read");
  if (forbidden) return <Forbidden role={user.role} what="The event data" />;
  const parsed = DatasetListQuerySchema.safeParse(await searchParams);
  const query = parsed.success ? parsed.data : DatasetListQuerySchema.parse({});
  const [{ rows, total, page, pageSize }, sites] = await Promise.all([listDatasets(query), listSites()]);
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const href = (patch: Record<string, string | number | undefined>) => {
    const p = new URLSearchParams();
    const merged = { q: query.q, siteId: query.siteId, sort: query.sort, dir: query.dir, page: query.page, ...patch };
    for (const [k, v] of Object.entries(merged)) if (v !== undefined && v !== "") p.set(k, String(v));
    return `/data?${p}`;
  };
  return (
    <>
      <PageHeader
        title="Data"
        lead="Event lists per array site. Each dataset keeps every version and the SHA-256 of its canonical event table."
        actions={
          <div className="flex gap-2">
            <Link href="/data/sites" className="rounded-md border border-slate-300 bg-white px-4 py-2 text-sm">Sites</Link>
            {can(user.role, "datasets:upload") ? <Link href="/data/upload" className="rounded-md bg-night-800 px-4 py-2 text-sm text-white">Upload events</Link> : null}
          </div>
        }
      />
      <Card>
        <form className="mb-4 flex flex-wrap items-end gap-3" role="search" action="/data">
          <div>
            <label htmlFor="q" className="block text-sm font-medium">Name contains</label>
            <input id="q" name="q" defaultValue={query.q} className="mt-1 rounded-md border border-slate-300 px-3 py-1.5" />
          </div>
          <div>
            <label htmlFor="siteId" className="block text-sm font-medium">Site</label>
            <select id="siteId" name="siteId" defaultValue={query.siteId ?? ""} className="mt-1 rounded-md border border-slate-300 px-3 py-1.5">
              <option value="">All sites</option>
              {sites.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
            </select>
          </div>
          <input type="hidden" name="sort" value={query.sort} />
          <input type="hidden" name="dir" value={query.dir} />
          <button type="submit" className="rounded-md border border-slate-300 px-3 py-1.5 text-sm">Filter</button>
        </form>
        <table className="w-full text-sm">
          <caption className="sr-only">Datasets, {total} in all, page {page} of {pages}</caption>
          <thead className="text-left text-slate-500">
            <tr>
              {COLUMNS.map((c) => {
                const active = query.sort === c.key;
                const dir = active && query.dir === "asc" ? "desc" : "asc";
                return (
                  <th key={c.key} scope="col" aria-sort={active ? (query.dir === "asc" ? "ascending" : "descending") : "none"}>
                    <Link href={href({ sort: c.key, dir, page: 1 })} className="hover:underline">
                      {c.label}{active ? (query.dir === "asc" ? " ▲" : " ▼") : ""}
                    </Link>
                  </th>
                );
              })}
              <th scope="col">Site</th>
              <th scope="col">Version</th>
            </tr>
          </thead>
          <tbody>
            {rows.length === 0 ? (
              <tr><td colSpan={6} className="py-4 text-slate-600">No dataset matches.</td></tr>
            ) : rows.map((d) => (
              <tr key={d.id} className="border-t border-slate-100">
                <td className="py-2 pr-2">
                  <Link href={`/data/${d.id}`} className="font-medium text-night-700 underline-offset-2 hover:underline">{d.name}</Link>
                  {d.blinded ? <span className="ml-2 rounded bg-slate-800 px-1.5 py-0.5 text-xs text-white">blinded</span> : null}
                  {d.status !== "ready" ? <span className="ml-2 text-xs text-amber-700">{d.status}</span> : null}
                </td>
                <td className="py-2 pr-2 tabular-nums">{d.eventCount.toLocaleString("en")}</td>
                <td className="py-2 pr-2">{d.timeStart ? `${d.timeStart.slice(0, 10)} – ${d.timeEnd?.slice(0, 10)}` : "—"}</td>
                <td className="py-2 pr-2">{d.createdAt.slice(0, 10)}</td>
                <td className="py-2 pr-2">{d.siteName}</td>
                <td className="py-2">v{d.version}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <nav aria-label="Pages" className="mt-4 flex items-center gap-3 text-sm">
          {page > 1 ? <Link href={href({ page: page - 1 })} className="underline">Previous</Link> : <span className="text-slate-400">Previous</span>}
          <span>Page {page} of {pages} · {total} datasets</span>
          {page < pages ? <Link href={href({ page: page + 1 })} className="underline">Next</Link> : <span className="text-slate-400">Next</span>}
        </nav>
      </Card>
    </>
  );
}
