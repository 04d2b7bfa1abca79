"use client";

import { useRouter } from "next/navigation";
import { useEffect, useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { useHydrated } from "@/components/ui/use-hydrated";
import { NewAnalysisSchema } from "@/lib/validations/analysis";

interface DatasetOption { id: number; name: string; version: number; eventCount: number }
interface CoverageOption { id: number; name: string; latitudeDeg: number; zenithMaxDeg: number; efficiency: { kind: string } }

const list = (text: string) => text.split(/[\s,;]+/).filter(Boolean).map(Number);

/** The new-analysis form: validated with the same zod schema as the server, then POST /api/analyses. */
export function NewAnalysisForm({ datasets, defaultSeed, initialDatasetId }: { datasets: DatasetOption[]; defaultSeed: number; initialDatasetId?: number }) {
  const router = useRouter();
  const [kind, setKind] = useState<"hotspot" | "large-scale">("hotspot");
  const [datasetId, setDatasetId] = useState<number>(initialDatasetId ?? datasets[0]?.id ?? 0);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const dataset = datasets.find((d) => d.id === datasetId);
  const hydrated = useHydrated();
  // Saved coverage configurations that can stand in for the analytic exposure (optional).
  const [coverageOptions, setCoverageOptions] = useState<CoverageOption[]>([]);
  const [coverageId, setCoverageId] = useState<number | null>(null);
  useEffect(() => {
    let live = true;
    fetch("/api/coverage/configurations").then((r) => (r.ok ? r.json() : { configurations: [] })).then((j) => { if (live) setCoverageOptions(j.configurations ?? []); }).catch(() => {});
    return () => { live = false; };
  }, []);
  const coverage = coverageOptions.find((c) => c.id === coverageId) ?? null;

  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const body = {
      name: String(f.get("name") ?? ""),
      purpose: String(f.get("purpose") ?? ""),
      settings: {
        kind,
        datasetId,
        datasetVersion: Number(f.get("datasetVersion")),
        zenithMaxDeg: Number(f.get("zenithMaxDeg")),
        energyThresholdsEeV: list(String(f.get("energyThresholdsEeV") ?? "")),
        nside: Number(f.get("nside") ?? 64),
        radiiDeg: kind === "hotspot" ? list(String(f.get("radiiDeg") ?? "")) : [20],
        exposure: String(f.get("exposure") ?? "sommers-precessed"),
        nSkies: Number(f.get("nSkies") ?? 1000),
        seed: Number(f.get("seed")),
        weighted: f.get("weighted") === "on",
        ...(coverage ? { coverageConfigurationId: coverage.id, zenithMaxDeg: coverage.zenithMaxDeg } : {}),
      },
    };
    const parsed = NewAnalysisSchema.safeParse(body);
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path.join("."), i.message])));
      setMessage("Check the highlighted fields.");
      return;
    }
    setErrors({});
    setPending(true);
    const response = await fetch("/api/analyses", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(parsed.data) });
    const json = await response.json();
    setPending(false);
    if (response.status === 202) {
      router.push(`/analyses/${json.analysis.id}`);
      return;
    }
    setErrors(Object.fromEntries((json.error?.issues ?? []).map((i: { path: string; message: string }) => [i.path, i.message])));
    setMessage(json.error?.message ?? "The analysis could not be started.");
  }

  const field = (name: string, label: string, input: React.ReactNode, hint?: string) => (
    <div>
      <label htmlFor={name} className="block text-sm font-medium">{label}</label>
      {input}
      {hint ? <p className="mt-0.5 text-xs text-slate-500">{hint}</p> : null}
      {errors[name] || errors[`settings.${name}`] ? <p className="mt-1 text-sm text-red-700">{errors[name] ?? errors[`settings.${name}`]}</p> : null}
    </div>
  );
  const cls = "mt-1 w-full rounded-md border border-slate-300 px-3 py-1.5";

  if (datasets.length === 0) return <p className="text-slate-700">There is no dataset ready yet: upload one first.</p>;
  return (
    <form onSubmit={submit} className="space-y-5" aria-label="New analysis" noValidate data-hydrated={hydrated ? "true" : "false"}>
      <fieldset className="flex gap-6">
        <legend className="mb-1 text-sm font-medium">Kind</legend>
        <label className="flex items-center gap-2"><input type="radio" name="kind" checked={kind === "hotspot"} onChange={() => setKind("hotspot")} /> Hotspot scan (top-hat windows, Li-Ma, trials)</label>
        <label className="flex items-center gap-2"><input type="radio" name="kind" checked={kind === "large-scale"} onChange={() => setKind("large-scale")} /> Large-scale (Rayleigh, east-west, dipole)</label>
      </fieldset>
      <div className="grid gap-4 sm:grid-cols-3">
        {field("datasetId", "Dataset", (
          <select id="datasetId" value={datasetId} onChange={(e) => setDatasetId(Number(e.target.value))} className={cls}>
            {datasets.map((d) => <option key={d.id} value={d.id}>{d.name} ({d.eventCount.toLocaleString("en")} events)</option>)}
          </select>
        ))}
        {field("datasetVersion", "Version", (
          <select id="datasetVersion" name="datasetVersion" key={datasetId} defaultValue={dataset?.version} className={cls}>
            {Array.from({ length: dataset?.version ?? 1 }, (_, i) => (dataset?.version ?? 1) - i).map((v) => <option key={v} value={v}>v{v}</option>)}
          </select>
        ))}
        {coverage
          ? field("zenithMaxDeg", "Zenith cut (°)", <input id="zenithMaxDeg" name="zenithMaxDeg" type="number" readOnly value={coverage.zenithMaxDeg} className={`${cls} bg-slate-100`} />, "Set by the coverage configuration.")
          : field("zenithMaxDeg", "Zenith cut (°)", <input id="zenithMaxDeg" name="zenithMaxDeg" type="number" step="any" defaultValue={60} className={cls} />)}
        {coverageOptions.length > 0 ? field("coverageConfigurationId", "Exposure from a coverage configuration", (
          <select id="coverageConfigurationId" value={coverageId ?? ""} onChange={(e) => setCoverageId(e.target.value ? Number(e.target.value) : null)} className={cls}>
            <option value="">None: the dataset's site and this zenith cut</option>
            {coverageOptions.map((c) => <option key={c.id} value={c.id}>{c.name} (lat {c.latitudeDeg}°, cut {c.zenithMaxDeg}°{c.efficiency.kind === "table" ? ", efficiency table" : ""})</option>)}
          </select>
        ), "Its latitude, cut and efficiency are copied into the analysis's settings.") : null}
        {field("energyThresholdsEeV", "Energy thresholds (EeV)", <input id="energyThresholdsEeV" name="energyThresholdsEeV" placeholder="e.g. 8, 16, 32" className={cls} />, "Comma-separated; empty: all energies. Each threshold is a trial.")}
        {kind === "hotspot" ? (
          <>
            {field("radiiDeg", "Window radii (°)", <input id="radiiDeg" name="radiiDeg" defaultValue="20" className={cls} />, "Comma-separated; each radius is a trial.")}
            {field("nside", "Window centres (Nside)", (
              <select id="nside" name="nside" defaultValue={64} className={cls}>
                {[16, 32, 64, 128, 256].map((n) => <option key={n} value={n}>{n} ({(12 * n * n).toLocaleString("en")} windows)</option>)}
              </select>
            ))}
            {field("exposure", "Exposure model", (
              <select id="exposure" name="exposure" defaultValue="sommers-precessed" className={cls}>
                <option value="sommers-precessed">Analytic, precessed to ICRS (default)</option>
                <option value="sommers">Analytic on ICRS declinations</option>
                {coverage ? null : <option value="scrambled">Data-driven (time scrambling)</option>}
              </select>
            ))}
            {field("nSkies", "Isotropic trial skies", <input id="nSkies" name="nSkies" type="number" defaultValue={1000} min={10} max={10000} className={cls} />, "The post-trial probability comes from these skies.")}
          </>
        ) : (
          <label className="flex items-center gap-2 self-end text-sm"><input type="checkbox" name="weighted" /> Weight by sidereal-time coverage</label>
        )}
        {field("seed", "Random seed", <input id="seed" name="seed" type="number" defaultValue={defaultSeed} className={cls} />, "Saved with the analysis; the same seed gives the same skies.")}
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        {field("name", "Name", <input id="name" name="name" className={cls} />)}
        {field("purpose", "Purpose", <input id="purpose" name="purpose" placeholder="What is this analysis for?" className={cls} />)}
      </div>
      <div className="flex items-center gap-4">
        <Button type="submit" disabled={pending}>{pending ? "Starting…" : "Start analysis"}</Button>
        {message ? <p role="alert" className="text-sm text-red-700">{message}</p> : null}
      </div>
    </form>
  );
}
