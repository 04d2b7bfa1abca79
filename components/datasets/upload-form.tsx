"use client";

import Papa from "papaparse";
import { useState, type DragEvent } from "react";
import { Button } from "@/components/ui/button";
import { useHydrated } from "@/components/ui/use-hydrated";
import { JobProgress } from "./job-progress";
import { useUpload } from "./use-upload";

const ROLES = [
  { key: "time", label: "Time", required: true },
  { key: "zenith", label: "Zenith (°)", required: true },
  { key: "azimuth", label: "Azimuth (°)", required: true },
  { key: "energy", label: "Energy", required: false },
  { key: "id", label: "Event id", required: false },
] as const;
type RoleKey = (typeof ROLES)[number]["key"];

/** Reads the first 64 KiB of the file (decompressing .gz in the browser) for the preview. */
async function readHead(file: File): Promise<string> {
  const head = file.slice(0, 64 * 1024);
  const bytes = new Uint8Array(await head.arrayBuffer());
  if (bytes[0] === 0x1f && bytes[1] === 0x8b) {
    const reader = file.stream().pipeThrough(new DecompressionStream("gzip")).getReader();
    let text = "";
    const decoder = new TextDecoder();
    while (text.length < 64 * 1024) {
      const { done, value } = await reader.read();
      if (done) break;
      text += decoder.decode(value, { stream: true });
    }
    await reader.cancel();
    return text;
  }
  return new TextDecoder().decode(bytes);
}

export function UploadForm({ sites }: { sites: { id: number; name: string; azimuthConvention: string }[] }) {
  const [file, setFile] = useState<File | null>(null);
  const [header, setHeader] = useState<string[]>([]);
  const [rows, setRows] = useState<string[][]>([]);
  const [mapping, setMapping] = useState<Record<RoleKey, string>>({ time: "", zenith: "", azimuth: "", energy: "", id: "" });
  const [previewError, setPreviewError] = useState<string | null>(null);
  const [dragging, setDragging] = useState(false);
  const upload = useUpload();
  const hydrated = useHydrated();

  async function choose(f: File | null) {
    setFile(f);
    setHeader([]);
    setRows([]);
    setPreviewError(null);
    if (!f) return;
    try {
      const text = (await readHead(f)).replace(/^\uFEFF/, "");
      const lines = text.split(/\r?\n/).slice(0, 12).join("\n");
      const parsed = Papa.parse<string[]>(lines, { skipEmptyLines: true });
      const [h, ...rest] = parsed.data;
      if (!h || h.length < 3) {
        setPreviewError("The first line does not look like a comma-separated header with at least three columns. Is the delimiter a comma?");
        return;
      }
      setHeader(h);
      setRows(rest.slice(0, 8));
      const find = (...names: string[]) => h.find((c) => names.includes(c.trim().toLowerCase())) ?? "";
      setMapping({
        time: find("time", "utc", "timestamp", "gps_time", "unix_time"),
        zenith: find("zenith", "theta", "zenith_deg"),
        azimuth: find("azimuth", "phi", "azimuth_deg"),
        energy: find("energy", "e", "energy_eev"),
        id: find("id", "event_id", "eventid"),
      });
    } catch {
      setPreviewError("The file could not be read for a preview (a corrupt .gz?).");
    }
  }

  function onDrop(e: DragEvent) {
    e.preventDefault();
    setDragging(false);
    void choose(e.dataTransfer.files?.[0] ?? null);
  }

  const missing = ROLES.filter((r) => r.required && !mapping[r.key]);

  return (
    <form
      data-hydrated={hydrated ? "true" : "false"}
      aria-label="Upload an event list"
      onSubmit={(e) => {
        e.preventDefault();
        if (!file) return;
        const form = new FormData(e.currentTarget);
        const q = new URLSearchParams({
          name: String(form.get("name") ?? ""),
          siteId: String(form.get("siteId") ?? ""),
          description: String(form.get("description") ?? ""),
          fileName: file.name,
          timeFormat: String(form.get("timeFormat")),
          azimuthConvention: String(form.get("azimuthConvention")),
          energyUnit: String(form.get("energyUnit")),
          dropBadRows: String(form.get("dropBadRows") === "on"),
          blinded: String(form.get("blinded") === "on"),
        });
        for (const r of ROLES) if (mapping[r.key]) q.set(`${r.key}Column`, mapping[r.key]);
        upload.start(`/api/datasets?${q}`, file);
      }}
      className="space-y-5"
    >
      <div
        onDragOver={(e) => { e.preventDefault(); setDragging(true); }}
        onDragLeave={() => setDragging(false)}
        onDrop={onDrop}
        className={`rounded-lg border-2 border-dashed p-6 text-center ${dragging ? "border-dawn-500 bg-amber-50" : "border-slate-300 bg-white"}`}
      >
        <label htmlFor="upload-file" className="block font-medium">Event list: CSV or gzip-compressed CSV</label>
        <p className="text-sm text-slate-600">Drop the file here or choose it. One shower per row; a header line names the columns.</p>
        <input id="upload-file" type="file" accept=".csv,.gz,text/csv,application/gzip" className="mx-auto mt-2 block text-sm"
          onChange={(e) => void choose(e.target.files?.[0] ?? null)} />
        {file ? <p className="mt-2 text-sm">{file.name} · {(file.size / 2 ** 20).toFixed(2)} MiB</p> : null}
      </div>
      {previewError ? <p role="alert" className="text-sm text-red-700">{previewError}</p> : null}

      {header.length ? (
        <section aria-label="Preview and column mapping">
          <h2 className="text-base font-semibold">Preview (first rows)</h2>
          <div className="mt-2 overflow-x-auto">
            <table className="text-xs" data-testid="preview-table">
              <thead><tr>{header.map((h) => <th key={h} scope="col" className="border-b px-2 py-1 text-left">{h}</th>)}</tr></thead>
              <tbody>{rows.map((r, i) => <tr key={i}>{r.map((c, j) => <td key={j} className="px-2 py-0.5 font-mono">{c}</td>)}</tr>)}</tbody>
            </table>
          </div>
          <h2 className="mt-4 text-base font-semibold">Columns</h2>
          <div className="mt-2 grid gap-3 sm:grid-cols-5">
            {ROLES.map((r) => (
              <div key={r.key}>
                <label htmlFor={`map-${r.key}`} className="block text-sm font-medium">{r.label}{r.required ? "" : " (optional)"}</label>
                <select id={`map-${r.key}`} value={mapping[r.key]} onChange={(e) => setMapping({ ...mapping, [r.key]: e.target.value })}
                  className="mt-1 w-full rounded-md border border-slate-300 px-2 py-1.5 text-sm">
                  <option value="">{r.required ? "Choose…" : "None"}</option>
                  {header.map((h) => <option key={h} value={h}>{h}</option>)}
                </select>
              </div>
            ))}
          </div>
          <p className="mt-2 text-xs text-slate-500">Other columns are not stored. Zenith and azimuth are of the arrival direction (where the shower came from).</p>
        </section>
      ) : null}

      <div className="grid gap-3 sm:grid-cols-3">
        <div>
          <label htmlFor="timeFormat" className="block text-sm font-medium">Time format</label>
          <select id="timeFormat" name="timeFormat" defaultValue="iso" className="mt-1 w-full rounded-md border border-slate-300 px-2 py-1.5">
            <option value="iso">ISO 8601 UTC (2025-03-01T12:34:56.789Z)</option>
            <option value="unix">Unix seconds</option>
            <option value="gps">GPS seconds (since 1980-01-06, leap seconds applied)</option>
          </select>
        </div>
        <div>
          <label htmlFor="azimuthConvention" className="block text-sm font-medium">Azimuth convention</label>
          <select id="azimuthConvention" name="azimuthConvention" defaultValue="north-clockwise" className="mt-1 w-full rounded-md border border-slate-300 px-2 py-1.5">
            <option value="north-clockwise">North, clockwise (0° = N, 90° = E)</option>
            <option value="east-counterclockwise">East, counter-clockwise (0° = E, 90° = N)</option>
          </select>
        </div>
        <div>
          <label htmlFor="energyUnit" className="block text-sm font-medium">Energy unit</label>
          <select id="energyUnit" name="energyUnit" defaultValue="EeV" className="mt-1 w-full rounded-md border border-slate-300 px-2 py-1.5">
            <option value="EeV">EeV</option>
            <option value="eV">eV</option>
            <option value="log10eV">log10(E / eV)</option>
          </select>
        </div>
        <div>
          <label htmlFor="siteId" className="block text-sm font-medium">Site</label>
          <select id="siteId" name="siteId" required className="mt-1 w-full rounded-md border border-slate-300 px-2 py-1.5">
            {sites.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
          </select>
        </div>
        <div className="sm:col-span-2">
          <label htmlFor="name" className="block text-sm font-medium">Dataset name</label>
          <input id="name" name="name" required defaultValue={file ? file.name.replace(/\.csv(\.gz)?$/i, "") : ""} key={file?.name ?? "none"}
            className="mt-1 w-full rounded-md border border-slate-300 px-3 py-1.5" />
        </div>
        <div className="sm:col-span-3">
          <label htmlFor="description" className="block text-sm font-medium">Description (optional)</label>
          <input id="description" name="description" className="mt-1 w-full rounded-md border border-slate-300 px-3 py-1.5" />
        </div>
      </div>
      <fieldset className="space-y-1 text-sm">
        <legend className="font-medium">Options</legend>
        <label className="flex items-center gap-2"><input type="checkbox" name="dropBadRows" /> Drop bad rows (by default a file with any bad row is rejected whole; the count dropped is saved)</label>
        <label className="flex items-center gap-2"><input type="checkbox" name="blinded" /> Upload blinded (right ascensions shifted by a secret offset until an analyst unblinds)</label>
      </fieldset>
      <Button type="submit" disabled={!file || missing.length > 0 || upload.busy}>
        {upload.busy ? "Uploading…" : missing.length && file ? `Map ${missing.map((m) => m.label.toLowerCase()).join(", ")} first` : "Upload and store"}
      </Button>
      <JobProgress sent={upload.sent} job={upload.job} error={upload.error ?? upload.jobError} />
    </form>
  );
}
