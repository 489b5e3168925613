import { HttpClient, HttpEvent, httpResource } from '@angular/common/http';
import { inject, Injectable, InjectionToken } from '@angular/core';
import type {
  DetrendOptions,
  LightCurveValueKind,
  PhotometryRunStatus,
  ProgramPhotometry,
  TargetPhotometry,
  TimeSystem,
} from '@spincycle/shared/photometry/photometry';
import { Observable } from 'rxjs';

/** How often the page asks for the progress of a queued or running analysis. */
export const PHOTOMETRY_POLL_MS = new InjectionToken<number>('PHOTOMETRY_POLL_MS', { factory: () => 1000 });

/** The form fields of an upload besides its files (undefined: not sent, the files say it). */
export interface LightCurveUploadForm {
  timeSystem?: TimeSystem;
  valueKind?: LightCurveValueKind;
  /** The target of files without a `target` column. */
  targetId?: number;
  detrend: DetrendOptions;
}

/** One target of one program. */
export interface TargetRef {
  proposalId: number;
  targetId: number;
}

const base = (proposalId: number) => `/api/proposals/${proposalId}/photometry`;

/**
 * The multipart body of an upload: every file under `files`, and the text fields the server
 * reads (`clipSigma` and `binMinutes` empty for "none").
 */
export function lightCurveUploadBody(files: readonly File[], form: LightCurveUploadForm): FormData {
  const body = new FormData();
  for (const file of files) body.append('files', file, file.name);
  if (form.timeSystem) body.append('timeSystem', form.timeSystem);
  if (form.valueKind) body.append('valueKind', form.valueKind);
  if (form.targetId !== undefined) body.append('targetId', String(form.targetId));
  body.append('offsets', form.detrend.offsets);
  body.append('clipSigma', form.detrend.clipSigma === null ? '' : String(form.detrend.clipSigma));
  body.append('binMinutes', form.detrend.binMinutes === null ? '' : String(form.detrend.binMinutes));
  return body;
}

/**
 * All HTTP of a program's returned photometry: the program's table, one target's measurement,
 * uploads of light curves, a new analysis with other detrending choices, the analysis's
 * progress and the table's CSV export. Resources must be created in an injection context; a
 * getter returning null reads nothing.
 */
@Injectable({ providedIn: 'root' })
export class PhotometryApi {
  private readonly http = inject(HttpClient);

  /** GET /api/proposals/:id/photometry (404 not on the team, 409 `no_program` before the award). */
  programResource(proposalId: () => number | null) {
    return httpResource<ProgramPhotometry>(() => {
      const id = proposalId();
      return id === null ? undefined : base(id);
    });
  }

  /** GET …/photometry/targets/:targetId (404 `target_not_found`). */
  targetResource(target: () => TargetRef | null) {
    return httpResource<TargetPhotometry>(() => {
      const t = target();
      return t === null ? undefined : `${base(t.proposalId)}/targets/${t.targetId}`;
    });
  }

  /**
   * POST …/photometry/uploads (multipart), with upload progress; answers 202 with the analysis
   * it queued. A refused file answers 400 `invalid_light_curve` with every problem
   * (LightCurveErrorBody) and stores nothing.
   */
  upload(proposalId: number, files: readonly File[], form: LightCurveUploadForm): Observable<HttpEvent<{ run: PhotometryRunStatus }>> {
    return this.http.post<{ run: PhotometryRunStatus }>(`${base(proposalId)}/uploads`, lightCurveUploadBody(files, form), {
      reportProgress: true,
      observe: 'events',
    });
  }

  /** POST …/photometry/analyses: every stored light curve analysed again with these choices. */
  reanalyse(proposalId: number, detrend: DetrendOptions): Observable<{ run: PhotometryRunStatus }> {
    return this.http.post<{ run: PhotometryRunStatus }>(`${base(proposalId)}/analyses`, { detrend });
  }

  /** GET …/photometry/run: the latest analysis (404 `run_not_found` before the first). */
  runStatus(proposalId: number): Observable<PhotometryRunStatus> {
    return this.http.get<PhotometryRunStatus>(`${base(proposalId)}/run`);
  }

  /** GET …/photometry/export.csv (a download link). */
  exportUrl(proposalId: number): string {
    return `${base(proposalId)}/export.csv`;
  }
}
