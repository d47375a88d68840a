'use client';

import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm, useWatch, type Resolver } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { submissionMetadataSchema, type SubmissionMetadata } from '@/lib/schemas/submission';
import { buttonClass, inputClass } from '@/components/forms/field';
import { api, NO_ANSWER, type ApiFailure } from '@/lib/api-client';
import { clearDraft, loadDraft, saveDraft } from './draft';
import { FileCard, type FileConditions, type FileProblem, type PreviewState } from './file-card';
import { MetadataFields, asNumber, type MetadataForm } from './metadata-fields';
import { NeffPanel } from './neff-panel';
import { PassbandChart } from './passband-chart';
import { fileFailure, type PreviewMetadata, type ReaderOptions } from './preview-api';
import { UploadDropzone, UploadRefused, submitStaged, useSubmissionUppy, type UploadBody } from './uploader';

type Added = { id: string; name: string; size: number; data: Blob };
type FileMeta = { name: string; aoiDeg?: number; reader?: ReaderOptions; temperatureC?: number; polarization?: 'unpolarized' | 's' | 'p' };
type Draft = { values: Partial<MetadataForm>; aoi: Record<string, string>; reader: Record<string, ReaderOptions>; conditions?: Record<string, FileConditions> };

export type WorkbenchMode =
  | { kind: 'new' }
  | { kind: 'revise'; submissionId: number; initial: Partial<MetadataForm>; currentFiles: FileMeta[] };

const EMPTY: Partial<MetadataForm> = { label: '', lines: [], licence: 'CC-BY-4.0', method: { polarization: 'unpolarized' } as MetadataForm['method'] };

/** A bench file is often named for its angle ("…_aoi12.csv", "…15deg.txt"); use that as the first guess. */
function aoiFromName(name: string): string | undefined {
  const m = name.match(/(?:aoi|angle)[\s_-]*(\d{1,2}(?:\.\d+)?)/i) ?? name.match(/(\d{1,2}(?:\.\d+)?)\s*(?:deg|°)/i);
  return m ? m[1] : undefined;
}

function compose(values: MetadataForm, files: FileMeta[]): MetadataForm {
  const first = files[0]?.aoiDeg;
  return {
    ...values,
    files: files.map((f) => ({
      name: f.name,
      aoiDeg: f.aoiDeg as number,
      ...(f.reader && Object.keys(f.reader).length ? { reader: f.reader } : {}),
      ...(f.temperatureC !== undefined ? { temperatureC: f.temperatureC } : {}),
      ...(f.polarization ? { polarization: f.polarization } : {}),
    })),
    method: { ...values.method, aoiDeg: first as number },
  };
}

/**
 * The contributor's bench-to-library workflow: drop files, watch each one read and
 * checked live, describe the filter and method, send it all as one request. Used for a
 * new submission and, with the same parts, for a revision after "changes requested".
 */
export function SubmissionWorkbench({ mode }: { mode: WorkbenchMode }) {
  const router = useRouter();
  const revise = mode.kind === 'revise';
  const endpoint = revise ? `/api/submissions/${mode.submissionId}/revise` : '/api/submissions';
  const draftKey = revise ? `revise-${mode.submissionId}` : 'submit';
  const uppy = useSubmissionUppy();

  const [files, setFiles] = useState<Added[]>([]);
  // The workbench only renders in the browser, so the draft can be read while the state is first made.
  const [draft] = useState(() => loadDraft<Draft>(draftKey));
  const [aoi, setAoi] = useState<Record<string, string>>(() => draft?.aoi ?? {});
  const [reader, setReader] = useState<Record<string, ReaderOptions>>(() => draft?.reader ?? {});
  const [conditions, setConditions] = useState<Record<string, FileConditions>>(() => draft?.conditions ?? {});
  const [previews, setPreviews] = useState<Record<string, PreviewState>>({});
  const [serverProblems, setServerProblems] = useState<Record<string, FileProblem>>({});
  const [summary, setSummary] = useState<string>();
  const [busy, setBusy] = useState(false);
  const summaryRef = useRef<HTMLDivElement>(null);

  // The resolver sees the files too: their names and AOIs are part of the metadata the schema checks.
  const filesMeta = useMemo<FileMeta[]>(() => {
    // kept files keep their reader settings; their AOIs can be corrected here
    if (files.length === 0 && revise) return mode.currentFiles.map((f) => ({ ...f, aoiDeg: aoi[f.name] !== undefined ? (asNumber(aoi[f.name]) as number | undefined) : f.aoiDeg }));
    return files.map((f) => ({
      name: f.name,
      aoiDeg: asNumber(aoi[f.name] ?? '') as number | undefined,
      reader: reader[f.name],
      temperatureC: asNumber(conditions[f.name]?.temperatureC ?? '') as number | undefined,
      polarization: conditions[f.name]?.polarization || undefined,
    }));
  }, [files, aoi, reader, conditions, revise, mode]);
  const filesRef = useRef(filesMeta);
  useEffect(() => {
    filesRef.current = filesMeta;
  }, [filesMeta]);
  const resolver = useMemo<Resolver<MetadataForm, unknown, SubmissionMetadata>>(() => {
    const inner = zodResolver(submissionMetadataSchema) as unknown as Resolver<MetadataForm, unknown, SubmissionMetadata>;
    return (values, ctx, options) => inner(compose(values, filesRef.current), ctx, options);
  }, []);

  const form = useForm<MetadataForm, unknown, SubmissionMetadata>({
    resolver,
    defaultValues: { ...(revise ? mode.initial : EMPTY), ...draft?.values },
    mode: 'onSubmit',
    reValidateMode: 'onChange',
  });

  // Keep the draft up to date with every keystroke.
  useEffect(() => {
    const save = () => saveDraft(draftKey, { values: form.getValues(), aoi, reader, conditions } satisfies Draft);
    save();
    return form.subscribe({ formState: { values: true }, callback: save });
  }, [form, aoi, reader, conditions, draftKey]);

  // Mirror Uppy's file list.
  useEffect(() => {
    const sync = () => setFiles(uppy.getFiles().map((f) => ({ id: f.id, name: f.name ?? 'file', size: f.size ?? 0, data: f.data as Blob })));
    const added = (file: { name?: string }) => {
      const name = file.name ?? '';
      setAoi((a) => (a[name] !== undefined ? a : { ...a, [name]: aoiFromName(name) ?? (uppy.getFiles().length === 1 ? '0' : '') }));
      sync();
    };
    const removed = (file: { id: string; name?: string }) => {
      setPreviews((p) => {
        const { [file.id]: _gone, ...rest } = p;
        return rest;
      });
      setServerProblems((s) => {
        const { [file.name ?? '']: _gone, ...rest } = s;
        return rest;
      });
      sync();
    };
    uppy.on('file-added', added);
    uppy.on('file-removed', removed);
    sync();
    return () => {
      uppy.off('file-added', added);
      uppy.off('file-removed', removed);
    };
  }, [uppy]);

  // Live preview: every file is read and checked by the server as soon as it is added,
  // and again whenever its reader options, its AOI or the fields the checks use change.
  const watched = useWatch({ control: form.control, name: ['lines', 'nominalCwlNm', 'nominalFwhmNm', 'method.resolutionNm', 'method.beam', 'method.beamFNumber', 'method.instrument', 'method.temperatureC'] });
  const checkKey = JSON.stringify(watched);
  const checkMeta = useMemo<PreviewMetadata>(() => {
    const [lines, nominalCwlNm, nominalFwhmNm, resolutionNm, beam, beamFNumber, instrument, temperatureC] = JSON.parse(checkKey) as unknown[];
    return { lines: lines as string[], nominalCwlNm: nominalCwlNm as number, nominalFwhmNm: nominalFwhmNm as number, method: { resolutionNm, beam, beamFNumber, instrument, temperatureC } as PreviewMetadata['method'] };
  }, [checkKey]);
  const previewKeys = useRef<Record<string, string>>({});
  const controllers = useRef<Record<string, AbortController>>({});
  useEffect(() => {
    const pending = files.filter((f) => previewKeys.current[f.id] === undefined);
    const t = setTimeout(() => {
      for (const f of files) {
        const options = reader[f.name] ?? {};
        const meta = { ...checkMeta, method: { ...checkMeta.method, aoiDeg: asNumber(aoi[f.name] ?? '') } };
        const key = JSON.stringify([options, meta]);
        if (previewKeys.current[f.id] === key) continue;
        previewKeys.current[f.id] = key;
        controllers.current[f.id]?.abort();
        const controller = new AbortController();
        controllers.current[f.id] = controller;
        setPreviews((p) => {
          const before = p[f.id];
          return { ...p, [f.id]: { state: 'loading', last: before?.state === 'ok' ? before.result : before?.state === 'loading' ? before.last : undefined } };
        });
        api.curves.preview(f.data, f.name, options, meta, controller.signal)
          .then((r) => {
            if (controller.signal.aborted) return;
            setPreviews((p) => ({
              ...p,
              [f.id]: r.ok
                ? { state: 'ok', result: r.data }
                : { state: 'error', status: r.status, problem: { message: r.failure.error, lines: (r.failure.details ?? []).filter((d) => d.line !== undefined) } },
            }));
          })
          .catch(() => undefined);
      }
    }, pending.length > 0 ? 0 : 450);
    return () => clearTimeout(t);
  }, [files, reader, aoi, checkMeta]);

  // A new file or a changed one makes an earlier refusal of it stale.
  const editFile = useCallback((name: string) => setServerProblems((s) => {
    if (!s[name]) return s;
    const { [name]: _gone, ...rest } = s;
    return rest;
  }), []);

  /**
   * Scans at several angles side by side in one file become a set, as if each
   * pair had come in its own file: the same bytes under one name per pair, each
   * read with its pair and given the angle its header names.
   */
  const splitPairs = useCallback((f: Added, angles: number[]) => {
    const dot = f.name.lastIndexOf('.');
    const stem = dot > 0 ? f.name.slice(0, dot) : f.name;
    const ext = dot > 0 ? f.name.slice(dot) : '';
    const names = angles.map((a, k) => (k === 0 ? f.name : `${stem}-pair${k + 1}-aoi${a}${ext}`));
    setReader((r) => {
      const { wavelengthColumn: _w, transmissionColumn: _t, ...kept } = r[f.name] ?? {};
      const next = { ...r };
      names.forEach((n, k) => (next[n] = { ...kept, pair: k + 1 }));
      return next;
    });
    setAoi((a) => {
      const next = { ...a };
      names.forEach((n, k) => (next[n] = String(angles[k])));
      return next;
    });
    for (let k = 1; k < names.length; k++) {
      if (uppy.getFiles().some((u) => u.name === names[k])) continue;
      try {
        uppy.addFile({ name: names[k], type: f.data.type || 'text/plain', data: f.data, source: 'pairs' });
      } catch {
        // a restriction (too many files) is shown by the dashboard itself
      }
    }
    editFile(f.name);
  }, [uppy, editFile]);

  function applyFailure(status: number, failure: ApiFailure) {
    const names = (files.length ? files.map((f) => f.name) : filesMeta.map((f) => f.name));
    const forFile = fileFailure(failure, names);
    if (forFile) setServerProblems((s) => ({ ...s, [forFile.name]: { message: forFile.message, lines: forFile.lines } }));
    let mapped = 0;
    for (const d of failure.details ?? []) {
      if (!d.field) continue;
      const field = d.field === 'method.aoiDeg' && files.length ? 'files.0.aoiDeg' : d.field;
      form.setError(field as never, { type: 'server', message: d.message });
      mapped++;
    }
    const lead =
      status === 401 ? 'You are signed out. Sign in again (in another tab), then send it again: your draft is kept.'
      : status === NO_ANSWER ? 'The connection broke and retrying did not help; check the network and press the button again.'
      : failure.error;
    setSummary(mapped > 0 && !forFile ? `${lead} The fields concerned are marked below.` : lead);
    requestAnimationFrame(() => summaryRef.current?.focus());
  }

  async function send(metadata: SubmissionMetadata) {
    setSummary(undefined);
    setServerProblems({});
    if (!revise && files.length === 0) {
      setSummary('Add at least one data file: drop it on the area above or choose it.');
      requestAnimationFrame(() => summaryRef.current?.focus());
      return;
    }
    const unreadable = files.filter((f) => previews[f.id]?.state === 'error').map((f) => f.name);
    if (unreadable.length) {
      setSummary(`Fix or remove ${unreadable.join(', ')} first: the reader could not read ${unreadable.length === 1 ? 'it' : 'them'} (see the lines named beside the file).`);
      requestAnimationFrame(() => summaryRef.current?.focus());
      return;
    }
    setBusy(true);
    try {
      const body = JSON.stringify(metadata);
      let result: UploadBody | undefined;
      if (files.length > 0) {
        // Files that failed last time go again together with any new ones.
        const all = uppy.getFiles();
        if (all.some((f) => f.error)) {
          for (const f of all) if (f.error) uppy.setFileState(f.id, { error: null, progress: { ...f.progress, uploadStarted: null, uploadComplete: false, percentage: 0, bytesUploaded: false } });
        }
        let refused: { status: number; failure: ApiFailure } | undefined;
        const asRefusal = (err: unknown) => (err instanceof UploadRefused ? { status: err.status, failure: err.body } : { status: 0, failure: { error: (err as Error)?.message ?? 'upload failed' } });
        const onError = (_f: unknown, err: unknown) => {
          refused ??= asRefusal(err);
        };
        uppy.on('upload-error', onError);
        try {
          // Each file to the file store (presigned PUT), then the submission naming them.
          const outcome = await uppy.upload();
          if (!refused && outcome && (outcome.failed?.length ?? 0) === 0) result = await submitStaged(endpoint, uppy, metadata);
        } catch (err) {
          // A refusal reaches us twice, as the event above and as this rejection; the event's copy carries the body.
          refused ??= asRefusal(err);
        } finally {
          uppy.off('upload-error', onError);
        }
        if (!result) {
          const r = refused ?? { status: 0, failure: { error: 'The upload did not finish.' } };
          // A submission the server refused after the files arrived: they go to the file store again next time.
          for (const f of uppy.getFiles()) uppy.setFileState(f.id, { progress: { ...f.progress, uploadStarted: null, uploadComplete: false, percentage: 0, bytesUploaded: false } });
          return applyFailure(r.status, r.failure);
        }
      } else {
        const formData = new FormData();
        formData.append('metadata', body);
        const res = await api.submissions.send(endpoint, formData);
        if (!res.ok) return applyFailure(res.status, res.failure);
        result = res.data;
      }
      clearDraft(draftKey);
      const target = `/account/submissions/${result.id}`;
      if (revise) {
        router.replace(`${target}?revised=1`);
        router.refresh();
      } else {
        router.push(`${target}?sent=1`);
      }
    } finally {
      setBusy(false);
    }
  }

  function invalid() {
    setSummary('Some fields need attention; each is marked beside it.');
    requestAnimationFrame(() => summaryRef.current?.focus());
  }

  const values = useWatch({ control: form.control }) as MetadataForm;
  const setPoints = files.flatMap((f) => {
    const p = previews[f.id];
    const cwl = p?.state === 'ok' ? p.result.metrics.cwlNm : null;
    const angle = asNumber(aoi[f.name] ?? '');
    return cwl != null && typeof angle === 'number' && Number.isFinite(angle) ? [{ name: f.name, aoiDeg: angle, cwlNm: cwl }] : [];
  });
  const errors = form.formState.errors;
  const aoiError = (i: number) => {
    const fileErr = (errors.files as unknown as { aoiDeg?: { message?: string } }[] | undefined)?.[i]?.aoiDeg?.message;
    return fileErr ?? (i === 0 ? errors.method?.aoiDeg?.message : undefined);
  };
  const conditionErrors = (i: number) => {
    const e = (errors.files as unknown as { temperatureC?: { message?: string }; polarization?: { message?: string } }[] | undefined)?.[i];
    return { temperatureC: e?.temperatureC?.message, polarization: e?.polarization?.message };
  };
  const filesNote = 'Text files only (.csv, .tsv, .txt, .dat, .asc) · up to 5 MB and 200 000 rows each · up to 20 files; several files = one filter measured at several angles';

  return (
    <form onSubmit={(e) => form.handleSubmit(send, invalid)(e)} noValidate className="space-y-8" aria-describedby="submit-summary">
      <section aria-labelledby="files-heading" className="space-y-4">
        <div>
          <h2 id="files-heading" className="text-lg font-semibold">{revise ? 'New files (optional)' : 'Data files'}<span className="text-bad" aria-label="required">{revise ? '' : ' *'}</span></h2>
          <p className="text-sm text-muted">
            {revise
              ? 'Add corrected files to replace the current ones, or leave this empty to keep them and change only the description.'
              : 'One file for a single measurement, or several for one filter measured at several angles (a curve set). Each file is read and checked as soon as you add it.'}
          </p>
        </div>
        <UploadDropzone uppy={uppy} note={filesNote} hasFiles={files.length > 0} />
        {revise && files.length === 0 && mode.currentFiles.length > 0 ? (
          <fieldset className="space-y-2 rounded-card border border-rule bg-panel p-4" data-testid="kept-files">
            <legend className="px-1 text-sm font-medium">Keeping the current files</legend>
            <p className="text-xs text-muted">If an angle was recorded wrongly, correct it here; the files themselves stay as they are.</p>
            {mode.currentFiles.map((f, i) => (
              <div key={f.name} className="flex flex-wrap items-center gap-3">
                <label htmlFor={`kept-aoi-${i}`} className="min-w-0 flex-1 truncate text-sm">
                  AOI of <span className="font-medium">{f.name}</span>
                </label>
                <div className="flex w-32">
                  <input id={`kept-aoi-${i}`} type="number" step="any" min={0} max={60} inputMode="decimal" value={aoi[f.name] ?? String(f.aoiDeg ?? '')}
                    onChange={(e) => {
                      const v = e.target.value;
                      setAoi((a) => ({ ...a, [f.name]: v }));
                      if (errors.files || errors.method?.aoiDeg) form.clearErrors(['files', 'method.aoiDeg']);
                    }}
                    aria-invalid={!!aoiError(i)} aria-describedby={aoiError(i) ? `kept-aoi-${i}-error` : undefined}
                    className={`${inputClass} figures rounded-r-none`} data-testid="kept-aoi-input" />
                  <span className="flex items-center rounded-r-card border border-l-0 border-rule px-2 text-sm text-muted">°</span>
                </div>
                {aoiError(i) ? <p id={`kept-aoi-${i}-error`} role="alert" className="w-full text-sm text-bad">{aoiError(i)}</p> : null}
              </div>
            ))}
          </fieldset>
        ) : null}
        <div className="space-y-4">
          {files.map((f, i) => (
            <FileCard
              key={f.id}
              index={i}
              total={files.length}
              name={f.name}
              bytes={f.size}
              aoi={aoi[f.name] ?? ''}
              aoiError={aoiError(i)}
              onAoi={(v) => {
                setAoi((a) => ({ ...a, [f.name]: v }));
                editFile(f.name);
                if (errors.files || errors.method?.aoiDeg) form.clearErrors(['files', 'method.aoiDeg']);
              }}
              conditions={conditions[f.name] ?? {}}
              conditionErrors={conditionErrors(i)}
              onConditions={(c) => {
                setConditions((all) => ({ ...all, [f.name]: c }));
                if (errors.files) form.clearErrors(['files']);
              }}
              preview={previews[f.id]}
              options={reader[f.name] ?? {}}
              onOptions={(o) => {
                setReader((r) => ({ ...r, [f.name]: o }));
                editFile(f.name);
              }}
              serverProblem={serverProblems[f.name]}
              targetLines={values.lines}
              chart={(result) => (
                <PassbandChart title={`Preview of ${f.name}`} fileName={f.name.replace(/\.[^.]+$/, '')} curves={[{ name: f.name, ...result.points }]}
                  nominal={{ cwlNm: values.nominalCwlNm, fwhmNm: values.nominalFwhmNm }} lineIds={values.lines} />
              )}
              onRemove={() => uppy.removeFile(f.id)}
              onSplitPairs={(angles) => splitPairs(f, angles)}
            />
          ))}
        </div>
        {files.length > 1 ? <NeffPanel points={setPoints} /> : null}
      </section>

      <MetadataFields form={form} fileCount={Math.max(files.length, revise ? mode.currentFiles.length : 0)} />

      <div className="space-y-3">
        <div id="submit-summary" ref={summaryRef} tabIndex={-1} aria-live="assertive">
          {summary ? <p role="alert" className="rounded-card border border-bad/60 bg-bad/5 p-3 text-sm text-bad" data-testid="submit-summary">{summary}</p> : null}
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <button type="submit" disabled={busy} className={buttonClass}>
            {busy ? 'Sending…' : revise ? 'Send the revision' : 'Submit for review'}
          </button>
          <span className="text-sm text-muted">
            {revise ? 'It goes back to the review queue.' : 'A moderator checks it against its method before it is published.'} Your draft is kept in this browser until it is sent.
          </span>
        </div>
      </div>
    </form>
  );
}
