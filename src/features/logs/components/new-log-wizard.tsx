import { useEffect, useId, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { LOG_FIELDS, type ColumnMapping, type Log, type LogField } from '@shared/schemas/as-applied.schema';
import { ProblemList } from '@/components/form/problem-list';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Select } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { Section } from '@/components/ui/section';
import { isApiError } from '@/lib/api-client';
import { formatNumber } from '@/lib/format';
import { useCreateLog } from '../api/create-log';
import { useLog } from '../api/get-log';
import { usePreviewLog } from '../api/preview-log';
import { LogProgress } from './log-progress';
import { formatBytes } from './log-table';
import { MappingStep, type MeteredOn } from './mapping-step';
import { initialDraft, initialRows, mappingOf, problemKey, type MappingDraft } from './mapping-values';

export type PrescriptionChoice = { id: string; label: string; replaced: boolean };
export type PlanterChoice = { id: string; name: string; groundSpeedSource: MeteredOn };

const FORMAT_WORDS = { csv: 'CSV', geojson: 'GeoJSON points', shapefile: 'zipped shapefile of points' };
const STEP_NAMES = ['The file', 'Its columns', 'Reading it'];

/** Where the person is: 1 choosing the file, 2 mapping its columns, 3 watching it being read. */
function Steps({ current }: { current: 1 | 2 | 3 }) {
  return (
    <ol aria-label="Steps" className="mb-5 flex flex-wrap gap-x-6 gap-y-1 text-sm">
      {STEP_NAMES.map((name, i) => {
        const n = i + 1;
        const state = n < current ? 'done' : n === current ? 'now' : 'later';
        return (
          <li
            key={name}
            aria-current={state === 'now' ? 'step' : undefined}
            className={`flex items-center gap-2 ${state === 'now' ? 'font-medium text-ink' : 'text-ink-soft'}`}
          >
            <span
              aria-hidden
              className={`grid size-5 place-items-center rounded-full border text-xs ${
                state === 'now'
                  ? 'border-clay-600 bg-clay-600 text-paper-raised'
                  : state === 'done'
                    ? 'border-clay-300 bg-clay-50 text-clay-700'
                    : 'border-ink-line'
              }`}
            >
              {state === 'done' ? '✓' : n}
            </span>
            {name}
          </li>
        );
      })}
    </ol>
  );
}

/** Server problems that belong beside a mapping field; the rest for a notice. */
function splitServerProblems(error: unknown) {
  const byField: Record<string, string> = {};
  let rest = false;
  if (!isApiError(error) || error.details.length === 0) return { byField, rest: !!error };
  for (const d of error.details) {
    const key = problemKey(d.path);
    const field = key.split('.')[0];
    if ((LOG_FIELDS as readonly string[]).includes(field) || key === 'meteredOn') byField[key] = d.message;
    else rest = true;
  }
  return { byField, rest };
}

/**
 * Bringing in an as-applied log: the prescription it was planted with, the planter and the file; then which
 * column holds what (with units) and what the controller metered on; then the reading, with its progress.
 * `onReady` is called once the log is read (the page then opens its audit).
 */
export function NewLogWizard({
  prescriptions,
  prescriptionId,
  onPrescription,
  planters,
  defaultPlanterId,
  onReady,
}: {
  prescriptions: PrescriptionChoice[];
  prescriptionId: string;
  onPrescription: (id: string) => void;
  planters: PlanterChoice[] | null;
  defaultPlanterId: string | null;
  onReady: (log: Log) => void;
}) {
  const fileId = useId();
  const [planterId, setPlanterId] = useState(defaultPlanterId ?? '');
  const [file, setFile] = useState<File | null>(null);
  const preview = usePreviewLog();
  const create = useCreateLog();
  const [draft, setDraft] = useState<MappingDraft | null>(null);
  const [rows, setRows] = useState<ColumnMapping['rows']>([]);
  const [meteredOn, setMeteredOn] = useState<MeteredOn | null>(null);
  const [tried, setTried] = useState(false);
  const [logId, setLogId] = useState('');
  const created = useLog(logId);
  const existing = useLog(preview.data?.existingLogId ?? '');

  // The planter of the prescription, once known (the list may load after the prescription).
  useEffect(() => {
    if (!planterId && defaultPlanterId) setPlanterId(defaultPlanterId);
  }, [planterId, defaultPlanterId]);
  const planter = planters?.find((p) => p.id === planterId) ?? null;

  const reset = () => {
    preview.reset();
    create.reset();
    setDraft(null);
    setTried(false);
    setLogId('');
  };

  const read = () => {
    if (!file || !prescriptionId) return;
    reset();
    preview.mutate(
      { file, prescriptionId, planterId },
      {
        onSuccess: (p) => {
          setDraft(initialDraft(p.columns, p.suggested, p.remembered));
          setRows(initialRows(p.columns, p.suggested, p.remembered));
        },
      },
    );
  };

  const p = preview.data;
  const metered: MeteredOn = meteredOn ?? planter?.groundSpeedSource ?? 'gnss';
  const local = draft ? mappingOf(draft, rows) : null;
  const server = splitServerProblems(create.error);
  const problems = { ...(tried ? local?.problems : {}), ...server.byField };

  const submit = () => {
    if (!p || !local || !planterId) return;
    setTried(true);
    if (Object.keys(local.problems).length > 0) {
      document.querySelector<HTMLElement>('[aria-label="Column mapping"] [aria-invalid="true"]')?.focus();
      return;
    }
    create.mutate(
      { fileId: p.fileId, prescriptionId, planterId, mapping: local.mapping, meteredOn: metered },
      {
        onSuccess: (log) => setLogId(log.id),
      },
    );
  };

  // Read: open the audit.
  const log = created.data;
  const onReadyRef = useRef(onReady);
  onReadyRef.current = onReady;
  useEffect(() => {
    if (log?.status === 'ready') onReadyRef.current(log);
  }, [log]);

  const setField = (f: LogField, next: Partial<MappingDraft[LogField]>) => {
    create.reset();
    setDraft((d) => (d ? { ...d, [f]: { ...d[f], ...next } } : d));
  };

  const existingLog = existing.data;
  const alreadyRead = !!p?.existingLogId && existingLog?.status !== 'failed';
  const step: 1 | 2 | 3 = logId ? 3 : p && draft && !alreadyRead ? 2 : 1;

  return (
    <>
      <Steps current={step} />
      <Section title="Prescription, planter and file" className="mb-7">
        <div className="grid max-w-4xl gap-4 sm:grid-cols-2">
          <FormField
            label="Planted with the prescription"
            hint="Its approved version, or one replaced since if that is what the planter had."
          >
            <Select
              value={prescriptionId}
              disabled={!!logId}
              onChange={(e) => {
                reset();
                setPlanterId('');
                onPrescription(e.target.value);
              }}
              placeholder="Choose a prescription"
            >
              {(['approved', 'replaced'] as const).map((group) => {
                const items = prescriptions.filter((x) => x.replaced === (group === 'replaced'));
                if (!items.length) return null;
                return (
                  <optgroup key={group} label={group === 'approved' ? 'Approved' : 'Replaced since'}>
                    {items.map((x) => (
                      <option key={x.id} value={x.id}>
                        {x.label}
                      </option>
                    ))}
                  </optgroup>
                );
              })}
            </Select>
          </FormField>
          <FormField
            label="Planter"
            hint="The planter the log came from; its last column mapping is offered."
          >
            <Select
              value={planterId}
              disabled={!prescriptionId || !planters || !!logId}
              onChange={(e) => {
                reset();
                setPlanterId(e.target.value);
                setMeteredOn(null);
              }}
              placeholder={
                !prescriptionId
                  ? 'Choose the prescription first'
                  : planters
                    ? 'Choose the planter'
                    : 'Loading…'
              }
              options={(planters ?? []).map((x) => ({ value: x.id, label: x.name }))}
            />
          </FormField>
          <div className="flex flex-col gap-1 sm:col-span-2">
            <label htmlFor={fileId} className="text-sm font-medium text-ink">
              Log file
            </label>
            <input
              id={fileId}
              type="file"
              accept=".csv,.txt,.geojson,.json,.zip"
              aria-describedby={`${fileId}-hint`}
              disabled={preview.isPending || !!logId}
              onChange={(e) => {
                reset();
                setFile(e.target.files?.[0] ?? null);
              }}
              className="text-sm file:mr-3 file:cursor-pointer file:rounded-card file:border file:border-ink-line file:bg-paper-raised file:px-3 file:py-1.5 file:text-sm file:font-medium file:text-ink hover:file:bg-paper"
            />
            <p id={`${fileId}-hint`} className="text-xs text-ink-soft">
              CSV, GeoJSON points or a zipped shapefile of points, as the planter’s display wrote it. The file
              is kept exactly as sent.
            </p>
          </div>
        </div>
        <div className="mt-4 flex flex-wrap items-center gap-3">
          <Button
            variant={p ? 'secondary' : 'primary'}
            disabled={!file || !prescriptionId || !planterId || !!logId}
            busy={preview.isPending}
            onClick={read}
          >
            {p ? 'Read it again' : 'Read the file'}
          </Button>
          {p ? (
            <span className="text-sm text-ink-soft">
              Read <span className="font-medium text-ink">{p.fileName}</span> ({formatBytes(p.sizeBytes)}) as{' '}
              {FORMAT_WORDS[p.format]}: {formatNumber(p.columns.length)} columns.
            </span>
          ) : null}
        </div>
        {preview.isError ? (
          <Notice tone="danger" title="The file could not be read" className="mt-3 max-w-3xl">
            <ProblemList error={preview.error} />
            <p className="mt-1">Nothing was saved. Check the file, or choose another, and try again.</p>
          </Notice>
        ) : null}
        {p?.existingLogId && existingLog ? (
          existingLog.status === 'failed' ? (
            <Notice
              tone="caution"
              title="This file was uploaded already, and could not be read"
              className="mt-3 max-w-3xl"
            >
              {existingLog.error?.line != null ? `Line ${formatNumber(existingLog.error.line)}: ` : ''}
              {existingLog.error?.message}. Map its columns again below.
            </Notice>
          ) : (
            <Notice tone="info" title="This file was uploaded already" className="mt-3 max-w-3xl">
              The same file was brought in on {new Date(existingLog.createdAt).toLocaleDateString('en-GB')}.{' '}
              <Link className="font-medium text-clay-700 underline" to={`/logs/${existingLog.id}/audit`}>
                Open its audit
              </Link>
            </Notice>
          )
        ) : null}
      </Section>

      {p && draft && !alreadyRead && step === 2 ? (
        <Section title="Which column holds what">
          <p className="mb-3 max-w-3xl text-sm text-ink-soft">
            {p.remembered
              ? `Filled in from the last log of ${planter?.name ?? 'this planter'}; check each line against the first values.`
              : 'Filled in from the names in the file’s header; check each line against the first values.'}
          </p>
          <MappingStep
            columns={p.columns}
            sample={p.sample}
            draft={draft}
            rows={rows}
            problems={problems}
            meteredOn={metered}
            planterSource={planter?.groundSpeedSource ?? null}
            onChange={setField}
            onMeteredOn={(v) => {
              create.reset();
              setMeteredOn(v);
            }}
          />
          {server.rest ? (
            <Notice tone="danger" title="Not sent" className="mt-4 max-w-3xl">
              <ProblemList error={create.error} />
            </Notice>
          ) : null}
          {tried && local && Object.keys(local.problems).length > 0 ? (
            <p role="alert" className="mt-4 text-sm font-medium text-danger">
              Some lines need a column or a unit: see beside them.
            </p>
          ) : null}
          <div className="mt-4">
            <Button variant="primary" busy={create.isPending} onClick={submit}>
              Read the log
            </Button>
          </div>
        </Section>
      ) : null}

      {step === 3 ? (
        <Section title="Reading the log">
          {log ? <LogProgress log={log} /> : <p className="text-sm text-ink-soft">Starting…</p>}
        </Section>
      ) : null}
    </>
  );
}
