"use client";
/**
 * Drag-and-drop or pick log files; per file: what it is (kind, instrument, sensor, operator,
 * base site, time basis, clock offset), the column mapping over a preview of the first rows,
 * then upload with a progress bar each. Refusals list every problem and offer a CSV of them.
 */
import Link from "next/link";
import { useCallback, useRef, useState } from "react";
import { guessColumnMapping } from "@/src/core/logs";
import { headerSignature, previewHead, type HeaderPreview } from "@/src/server/logs/header-signature";
import type { ProblemRow, RefusalDetails } from "@/src/server/logs/errors";
import type { LogImportResult } from "@/src/server/logs/import-service";
import { problemsCsvName, problemsToCsv } from "@/src/server/logs/problems-csv";
import { MAPPABLE_ROLES, SENSOR_LABELS, SENSOR_TYPES, TIME_BASES, TIME_BASIS_LABELS, type MappableRole } from "@/src/server/logs/schema";
import { MAX_UPLOAD_BYTES } from "@/src/server/storage/limits";
import { Button } from "@/src/ui/button";
import { formatCount } from "@/src/ui/format";
import { AlertIcon, CheckIcon, StopIcon } from "@/src/ui/icons";
import { StatusChip } from "@/src/ui/status-chip";
import { sendLogUpload } from "./upload-request";

export interface ProfileOption {
  id: string;
  name: string;
  headerSignature: string;
  mapping: Record<string, string>;
}

const ROLE_LABELS: Record<MappableRole, string> = {
  time: "Time column",
  date: "Date column",
  field: "Field column",
  lat: "Latitude column",
  lon: "Longitude column",
  height: "Height column",
  line: "Line column",
  station: "Station column",
};
const HEAD_BYTES = 64 * 1024;

type Status = "ready" | "uploading" | "imported" | "refused" | "failed";

interface Entry {
  key: string;
  file: File;
  status: Status;
  progress: number;
  preview: HeaderPreview | null;
  localError: string | null;
  mapping: Partial<Record<MappableRole, string>>;
  profileName: string | null;
  kind: "base" | "rover";
  instrument: string;
  sensorType: string;
  operator: string;
  baseSiteName: string;
  baseLatitudeDeg: string;
  baseLongitudeDeg: string;
  baseHeightM: string;
  timeBasis: string;
  clockOffsetS: string;
  saveProfileAs: string;
  result: LogImportResult | null;
  error: { message: string; details?: RefusalDetails; fieldErrors?: Record<string, string[]> } | null;
}

let counter = 0;

function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} KB`;
  return `${(n / (1024 * 1024)).toFixed(1)} MB`;
}

async function readEntry(file: File, profiles: ProfileOption[], operator: string): Promise<Entry> {
  const entry: Entry = {
    key: `f${++counter}`,
    file,
    status: "ready",
    progress: 0,
    preview: null,
    localError: null,
    mapping: {},
    profileName: null,
    kind: /base/i.test(file.name) ? "base" : "rover",
    instrument: "",
    sensorType: "other",
    operator,
    baseSiteName: "",
    baseLatitudeDeg: "",
    baseLongitudeDeg: "",
    baseHeightM: "",
    timeBasis: "utc",
    clockOffsetS: "0",
    saveProfileAs: "",
    result: null,
    error: null,
  };
  if (file.size > MAX_UPLOAD_BYTES) {
    entry.localError = `This file is ${formatBytes(file.size)}: larger than the 200 MB limit. Split the log and upload the parts.`;
    return entry;
  }
  if (file.size === 0) {
    entry.localError = "This file is empty (0 bytes).";
    return entry;
  }
  const head = new Uint8Array(await file.slice(0, HEAD_BYTES).arrayBuffer());
  if (head.includes(0)) {
    entry.localError = "This is not a text log (it contains binary data). Export the log as CSV or plain text.";
    return entry;
  }
  let text = new TextDecoder("utf-8").decode(head);
  if (file.size <= HEAD_BYTES && !text.endsWith("\n")) text += "\n";
  entry.preview = previewHead(text, { maxRows: 6 });
  if (!entry.preview) {
    entry.localError = "No header row found in the first 64 KB of the file.";
    return entry;
  }
  const signature = headerSignature(entry.preview.header);
  const profile = profiles.find((p) => p.headerSignature === signature);
  if (profile) {
    entry.mapping = profile.mapping as Entry["mapping"];
    entry.profileName = profile.name;
  } else {
    const guess = guessColumnMapping(entry.preview.header);
    entry.mapping = guess.names as Entry["mapping"];
  }
  return entry;
}

function fieldsOf(e: Entry, acceptGoodRows: boolean): Record<string, string> {
  const mapping = Object.fromEntries(Object.entries(e.mapping).filter(([, v]) => v));
  return {
    kind: e.kind,
    instrument: e.instrument,
    sensorType: e.sensorType,
    operator: e.operator,
    timeBasis: e.timeBasis,
    clockOffsetS: e.clockOffsetS,
    mapping: JSON.stringify(mapping),
    saveProfileAs: e.saveProfileAs,
    acceptGoodRows: acceptGoodRows ? "true" : "",
    ...(e.kind === "base" ? { baseSiteName: e.baseSiteName, baseLatitudeDeg: e.baseLatitudeDeg, baseLongitudeDeg: e.baseLongitudeDeg, baseHeightM: e.baseHeightM } : {}),
  };
}

function downloadCsv(fileName: string, problems: ProblemRow[]): void {
  const url = URL.createObjectURL(new Blob([problemsToCsv(problems)], { type: "text/csv" }));
  const a = document.createElement("a");
  a.href = url;
  a.download = problemsCsvName(fileName);
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

export function UploadPanel({ apiUrl, logsUrl, profiles, defaultOperator, surveyTimeZone }: { apiUrl: string; logsUrl: string; profiles: ProfileOption[]; defaultOperator: string; surveyTimeZone: string }) {
  const [entries, setEntries] = useState<Entry[]>([]);
  const [dragging, setDragging] = useState(false);
  const inputRef = useRef<HTMLInputElement>(null);

  const update = useCallback((key: string, patch: Partial<Entry>) => {
    setEntries((list) => list.map((e) => (e.key === key ? { ...e, ...patch } : e)));
  }, []);

  async function addFiles(files: FileList | File[]) {
    const read = await Promise.all(Array.from(files).map((f) => readEntry(f, profiles, defaultOperator)));
    setEntries((list) => [...list, ...read]);
  }

  async function upload(e: Entry, acceptGoodRows = false) {
    update(e.key, { status: "uploading", progress: 0, error: null, result: null });
    try {
      const { done } = sendLogUpload(apiUrl, e.file, fieldsOf(e, acceptGoodRows), (p) => update(e.key, { progress: p }));
      const answer = await done;
      if (answer.status === 201) {
        update(e.key, { status: "imported", progress: 1, result: answer.body as LogImportResult });
        return;
      }
      const err = (answer.body as { error?: { message?: string; details?: RefusalDetails; fieldErrors?: Record<string, string[]> } } | null)?.error;
      update(e.key, {
        status: "refused",
        error: { message: err?.message ?? `The server answered ${answer.status}.`, details: err?.details, fieldErrors: err?.fieldErrors },
      });
    } catch (x) {
      update(e.key, { status: "failed", error: { message: x instanceof Error ? x.message : "The upload failed." } });
    }
  }

  async function uploadAll() {
    for (const e of entries) if (e.status === "ready" && !e.localError) await upload(e);
  }

  const ready = entries.filter((e) => e.status === "ready" && !e.localError).length;
  const imported = entries.filter((e) => e.status === "imported").length;

  return (
    <div className="space-y-5">
      <div
        onDragOver={(ev) => {
          ev.preventDefault();
          setDragging(true);
        }}
        onDragLeave={() => setDragging(false)}
        onDrop={(ev) => {
          ev.preventDefault();
          setDragging(false);
          if (ev.dataTransfer.files.length) void addFiles(ev.dataTransfer.files);
        }}
        className={`rounded-lg border-2 border-dashed px-6 py-8 text-center ${dragging ? "border-tide-600 bg-tide-50" : "border-ink-200 bg-white"}`}
      >
        <p className="text-sm text-ink-700">Drop base and rover logs here, or</p>
        <label htmlFor="log-files" className="mt-2 inline-flex min-h-10 cursor-pointer items-center rounded-md bg-tide-700 px-3.5 py-2 text-sm font-medium text-white hover:bg-tide-800">
          Choose log files
        </label>
        <input
          ref={inputRef}
          id="log-files"
          type="file"
          multiple
          accept=".csv,.txt,.tsv,.dat,.log,text/plain,text/csv"
          className="sr-only"
          onChange={(ev) => {
            if (ev.target.files?.length) void addFiles(ev.target.files);
            ev.target.value = "";
          }}
        />
        <p className="mt-2 text-xs text-ink-500">CSV or plain-text logs up to 200 MB each. Times without an offset are read in the time basis you choose per file; the survey&apos;s zone is {surveyTimeZone}.</p>
      </div>

      {entries.map((e) => (
        <FileCard key={e.key} entry={e} update={update} onUpload={(accept) => upload(e, accept)} onRemove={() => setEntries((l) => l.filter((x) => x.key !== e.key))} surveyTimeZone={surveyTimeZone} />
      ))}

      {entries.length > 0 ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button onClick={() => void uploadAll()} disabled={ready === 0}>
            Upload {ready === 1 ? "1 file" : `${ready} files`}
          </Button>
          {imported > 0 ? (
            <Link href={logsUrl} className="text-sm text-tide-700 underline underline-offset-2">
              See the logs table ({imported} imported)
            </Link>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}

function FileCard({ entry: e, update, onUpload, onRemove, surveyTimeZone }: { entry: Entry; update: (key: string, patch: Partial<Entry>) => void; onUpload: (accept: boolean) => void; onRemove: () => void; surveyTimeZone: string }) {
  const id = (name: string) => `${e.key}-${name}`;
  const set = (patch: Partial<Entry>) => update(e.key, patch);
  const editable = e.status === "ready" || e.status === "refused" || e.status === "failed";
  const fieldErrors = e.error?.fieldErrors ?? {};
  const input = "block w-full rounded-md border border-ink-200 bg-white px-2.5 py-1.5 text-sm text-ink-900 focus:outline-2 focus:outline-tide-600";
  const label = "mb-1 block text-xs font-medium text-ink-700";
  const header = e.preview?.header ?? [];

  return (
    <section aria-label={`Log file ${e.file.name}`} className="rounded-lg border border-ink-100 bg-white p-4 shadow-sm" data-file={e.file.name}>
      <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
        <h2 className="min-w-0 break-all text-sm font-semibold text-ink-900">
          {e.file.name} <span className="num font-normal text-ink-500">{formatBytes(e.file.size)}</span>
        </h2>
        <div className="flex items-center gap-2">
          <StatusOf entry={e} />
          {e.status !== "uploading" ? (
            <Button variant="quiet" onClick={onRemove} aria-label={`Remove ${e.file.name}`}>
              Remove
            </Button>
          ) : null}
        </div>
      </div>

      {e.localError ? (
        <p role="alert" className="flex items-start gap-2 text-sm text-storm-700">
          <StopIcon size={16} className="mt-0.5 shrink-0" /> {e.localError}
        </p>
      ) : (
        <>
          <fieldset disabled={!editable} className="grid gap-3 sm:grid-cols-3 lg:grid-cols-4">
            <div>
              <label htmlFor={id("kind")} className={label}>Kind</label>
              <select id={id("kind")} className={input} value={e.kind} onChange={(ev) => set({ kind: ev.target.value as Entry["kind"] })}>
                <option value="rover">Rover</option>
                <option value="base">Base station</option>
              </select>
            </div>
            <div>
              <label htmlFor={id("instrument")} className={label}>Instrument label</label>
              <input id={id("instrument")} className={input} value={e.instrument} maxLength={80} onChange={(ev) => set({ instrument: ev.target.value })} placeholder="e.g. ROVER-OV-12" />
            </div>
            <div>
              <label htmlFor={id("sensor")} className={label}>Sensor type</label>
              <select id={id("sensor")} className={input} value={e.sensorType} onChange={(ev) => set({ sensorType: ev.target.value })}>
                {SENSOR_TYPES.map((s) => (
                  <option key={s} value={s}>{SENSOR_LABELS[s]}</option>
                ))}
              </select>
            </div>
            <div>
              <label htmlFor={id("operator")} className={label}>Operator</label>
              <input id={id("operator")} className={input} value={e.operator} maxLength={120} onChange={(ev) => set({ operator: ev.target.value })} />
            </div>
            <div>
              <label htmlFor={id("basis")} className={label}>Time basis</label>
              <select id={id("basis")} className={input} value={e.timeBasis} onChange={(ev) => set({ timeBasis: ev.target.value })}>
                {TIME_BASES.map((b) => (
                  <option key={b} value={b}>{b === "local" ? `Local (${surveyTimeZone})` : TIME_BASIS_LABELS[b]}</option>
                ))}
              </select>
            </div>
            <div>
              <label htmlFor={id("offset")} className={label}>Clock offset (s, added)</label>
              <input id={id("offset")} className={`${input} num`} inputMode="decimal" value={e.clockOffsetS} onChange={(ev) => set({ clockOffsetS: ev.target.value })} />
              <Errors list={fieldErrors.clockOffsetS} />
            </div>
            {e.kind === "base" ? (
              <>
                <div>
                  <label htmlFor={id("site")} className={label}>Base station site</label>
                  <input id={id("site")} className={input} value={e.baseSiteName} maxLength={120} onChange={(ev) => set({ baseSiteName: ev.target.value })} placeholder="e.g. gatehouse paddock" />
                  <Errors list={fieldErrors.baseSiteName} />
                </div>
                <div className="grid grid-cols-3 gap-2 sm:col-span-2 lg:col-span-1">
                  <div>
                    <label htmlFor={id("lat")} className={label}>Lat (°)</label>
                    <input id={id("lat")} className={`${input} num`} inputMode="decimal" value={e.baseLatitudeDeg} onChange={(ev) => set({ baseLatitudeDeg: ev.target.value })} />
                  </div>
                  <div>
                    <label htmlFor={id("lon")} className={label}>Lon (°)</label>
                    <input id={id("lon")} className={`${input} num`} inputMode="decimal" value={e.baseLongitudeDeg} onChange={(ev) => set({ baseLongitudeDeg: ev.target.value })} />
                  </div>
                  <div>
                    <label htmlFor={id("height")} className={label}>Height (m)</label>
                    <input id={id("height")} className={`${input} num`} inputMode="decimal" value={e.baseHeightM} onChange={(ev) => set({ baseHeightM: ev.target.value })} />
                  </div>
                  <div className="col-span-3"><Errors list={[...(fieldErrors.baseLatitudeDeg ?? []), ...(fieldErrors.baseLongitudeDeg ?? [])]} /></div>
                </div>
              </>
            ) : null}
          </fieldset>

          <details className="mt-4" open={e.status === "ready"}>
            <summary className="cursor-pointer text-sm font-medium text-ink-800">
              Column mapping {e.profileName ? <span className="font-normal text-tide-700">— profile “{e.profileName}” applied</span> : <span className="font-normal text-ink-500">— guessed from the header; check it</span>}
            </summary>
            <fieldset disabled={!editable} className="mt-3 grid gap-3 sm:grid-cols-4">
              {MAPPABLE_ROLES.map((role) => (
                <div key={role}>
                  <label htmlFor={id(`map-${role}`)} className={label}>
                    {ROLE_LABELS[role]}
                    {role === "time" || role === "field" ? <span className="text-storm-700"> *</span> : null}
                  </label>
                  <select
                    id={id(`map-${role}`)}
                    className={input}
                    value={e.mapping[role] ?? ""}
                    onChange={(ev) => set({ mapping: { ...e.mapping, [role]: ev.target.value || undefined }, profileName: null })}
                  >
                    <option value="">— not in this file —</option>
                    {header.map((h, i) => (
                      <option key={`${h}-${i}`} value={h}>{h || `column ${i + 1}`}</option>
                    ))}
                  </select>
                </div>
              ))}
              <div className="sm:col-span-2">
                <label htmlFor={id("profile")} className={label}>Save this mapping as a profile (optional)</label>
                <input id={id("profile")} className={input} value={e.saveProfileAs} maxLength={80} onChange={(ev) => set({ saveProfileAs: ev.target.value })} placeholder="e.g. Rover laptop export" />
              </div>
            </fieldset>
            {e.preview ? <PreviewTable preview={e.preview} mapping={e.mapping} /> : null}
          </details>

          {e.status === "uploading" || e.progress > 0 ? (
            <div className="mt-4">
              <label htmlFor={id("progress")} className="mb-1 block text-xs text-ink-600">
                Upload progress <span className="num">{Math.round(e.progress * 100)} %</span>
                {e.status === "uploading" && e.progress >= 1 ? " — reading and storing the readings…" : ""}
              </label>
              <progress id={id("progress")} className="h-2 w-full accent-tide-700" max={1} value={e.progress} aria-label={`Upload progress of ${e.file.name}`} />
            </div>
          ) : null}

          {e.status === "imported" && e.result ? <ImportedNote result={e.result} /> : null}
          {e.error ? <RefusalNote entry={e} onAccept={() => onUpload(true)} /> : null}

          {e.status === "ready" || e.status === "failed" ? (
            <div className="mt-4">
              <Button variant="secondary" onClick={() => onUpload(false)}>
                Upload this file
              </Button>
            </div>
          ) : null}
        </>
      )}
    </section>
  );
}

function Errors({ list }: { list?: string[] }) {
  if (!list?.length) return null;
  return <p className="mt-1 text-xs text-storm-700">{list.join(" ")}</p>;
}

function StatusOf({ entry: e }: { entry: Entry }) {
  if (e.localError) return <StatusChip label="Cannot upload" tone="stop" />;
  switch (e.status) {
    case "ready":
      return <StatusChip label="Ready" tone="neutral" />;
    case "uploading":
      return <StatusChip label="Uploading" tone="info" />;
    case "imported":
      return <StatusChip label="Imported" tone="ok" />;
    case "refused":
      return <StatusChip label="Refused" tone="stop" />;
    case "failed":
      return <StatusChip label="Failed" tone="stop" />;
  }
}

function PreviewTable({ preview, mapping }: { preview: HeaderPreview; mapping: Partial<Record<MappableRole, string>> }) {
  const roleOf = (h: string) => (Object.entries(mapping).find(([, v]) => v === h)?.[0] as MappableRole | undefined) ?? null;
  return (
    <div className="mt-3 overflow-x-auto">
      <table className="min-w-full border-collapse text-xs">
        <caption className="sr-only">First rows of the file</caption>
        <thead>
          <tr>
            {preview.header.map((h, i) => {
              const role = roleOf(h);
              return (
                <th key={i} scope="col" className="border-b border-ink-200 px-2 py-1 text-left font-medium text-ink-700">
                  <div>{h}</div>
                  <div className={role ? "text-tide-700" : "text-ink-400"}>{role ? ROLE_LABELS[role].replace(" column", "") : "not used"}</div>
                </th>
              );
            })}
          </tr>
        </thead>
        <tbody>
          {preview.rows.map((r, ri) => (
            <tr key={ri} className="odd:bg-paper-50">
              {preview.header.map((_, ci) => (
                <td key={ci} className="num whitespace-nowrap px-2 py-0.5 text-ink-800">{r[ci] ?? ""}</td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function ImportedNote({ result }: { result: LogImportResult }) {
  const l = result.log;
  return (
    <div role="status" className="mt-4 space-y-1 rounded-md border border-moss-500/40 bg-moss-50 px-3 py-2 text-sm text-moss-700">
      <p className="flex items-center gap-2">
        <CheckIcon size={16} />
        <span>
          Imported <span className="num font-semibold">{formatCount(l.readingCount)}</span> readings
          {l.days.length ? <> on {l.days.join(", ")}</> : null}
          {l.rejectedCount ? <> ({formatCount(l.rejectedCount)} rows kept aside)</> : null}.{" "}
          <Link href={l.url} className="underline underline-offset-2">Open the log</Link>
        </span>
      </p>
      {result.warnings.map((w, i) => (
        <p key={i} className="flex items-start gap-2 text-flare-700">
          <AlertIcon size={14} className="mt-0.5 shrink-0" /> {w}
        </p>
      ))}
    </div>
  );
}

function RefusalNote({ entry: e, onAccept }: { entry: Entry; onAccept: () => void }) {
  const err = e.error!;
  const d = err.details;
  const problems = d?.problems ?? [];
  return (
    <div role="alert" className="mt-4 rounded-md border border-storm-500/40 bg-storm-50 px-3 py-2 text-sm text-storm-700">
      <p className="flex items-start gap-2">
        <StopIcon size={16} className="mt-0.5 shrink-0" /> <span>{err.message}</span>
      </p>
      {d?.existingLog ? (
        <p className="mt-1">
          <Link href={d.existingLog.url} className="underline underline-offset-2">Open “{d.existingLog.originalName}”</Link>
        </p>
      ) : null}
      {problems.length > 0 ? (
        <>
          <div className="mt-2 max-h-72 overflow-auto rounded border border-storm-500/20 bg-white">
            <table className="min-w-full text-xs text-ink-800">
              <caption className="sr-only">Problems found in {e.file.name}</caption>
              <thead className="sticky top-0 bg-white">
                <tr>
                  {["Line", "Column", "Value", "Reason"].map((h) => (
                    <th key={h} scope="col" className="border-b border-ink-100 px-2 py-1 text-left font-medium">{h}</th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {problems.slice(0, 200).map((p, i) => (
                  <tr key={i}>
                    <td className="num px-2 py-0.5">{p.line}</td>
                    <td className="px-2 py-0.5">{p.column}</td>
                    <td className="num px-2 py-0.5 break-all">{p.value}</td>
                    <td className="px-2 py-0.5">{p.message}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {problems.length > 200 ? <p className="mt-1 text-xs">The first 200 of {formatCount(problems.length)} listed problems are shown; the CSV has them all.</p> : null}
          <div className="mt-2 flex flex-wrap gap-2">
            <Button variant="secondary" onClick={() => downloadCsv(e.file.name, problems)}>Download problems (CSV)</Button>
            {d?.reason === "bad_rows" ? (
              <Button variant="primary" onClick={onAccept}>Import the good rows, keep the others listed</Button>
            ) : null}
          </div>
        </>
      ) : null}
    </div>
  );
}
