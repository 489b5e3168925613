import { HttpEventType, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Injector, runInInjectionContext, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { firstValueFrom, lastValueFrom, toArray } from 'rxjs';
import { lightCurveUploadBody, PhotometryApi } from './photometry-api';
import { testProgram, testRun, testTargetPhotometry } from './testing/photometry-fixtures';

describe('PhotometryApi', () => {
  let api: PhotometryApi;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    api = TestBed.inject(PhotometryApi);
    backend = TestBed.inject(HttpTestingController);
  });
  afterEach(() => backend.verify());

  const file = (name: string, text = 'time,mag\n1,2\n') => new File([text], name, { type: 'text/csv' });

  it('programResource: GET /api/proposals/:id/photometry, nothing while the id is null', async () => {
    const id = signal<number | null>(null);
    const resource = runInInjectionContext(TestBed.inject(Injector), () => api.programResource(() => id()));
    TestBed.tick();
    backend.expectNone(() => true);
    id.set(5);
    TestBed.tick();
    backend.expectOne({ method: 'GET', url: '/api/proposals/5/photometry' }).flush(testProgram());
    await new Promise((resolve) => setTimeout(resolve));
    expect(resource.value()?.targets).toHaveLength(3);
  });

  it('targetResource: GET …/photometry/targets/:targetId', async () => {
    const resource = runInInjectionContext(TestBed.inject(Injector), () => api.targetResource(() => ({ proposalId: 5, targetId: 14 })));
    TestBed.tick();
    backend.expectOne({ method: 'GET', url: '/api/proposals/5/photometry/targets/14' }).flush(testTargetPhotometry());
    await new Promise((resolve) => setTimeout(resolve));
    expect(resource.value()?.row.targetName).toBe('Lantern-14');
  });

  it('upload: multipart POST with every file under `files` and the form’s text fields, reporting progress', async () => {
    const events = lastValueFrom(
      api
        .upload(5, [file('a.csv'), file('b.csv')], {
          timeSystem: 'mjd_utc',
          valueKind: 'flux',
          targetId: 14,
          detrend: { offsets: 'node_night', clipSigma: 4.5, binMinutes: null },
        })
        .pipe(toArray()),
    );
    const req = backend.expectOne({ method: 'POST', url: '/api/proposals/5/photometry/uploads' });
    expect(req.request.reportProgress).toBe(true);
    const body = req.request.body as FormData;
    expect((body.getAll('files') as File[]).map((f) => f.name)).toEqual(['a.csv', 'b.csv']);
    expect(body.get('timeSystem')).toBe('mjd_utc');
    expect(body.get('valueKind')).toBe('flux');
    expect(body.get('targetId')).toBe('14');
    expect(body.get('offsets')).toBe('node_night');
    expect(body.get('clipSigma')).toBe('4.5');
    // No binning: an empty field, which the server reads as "none".
    expect(body.get('binMinutes')).toBe('');
    req.event({ type: HttpEventType.UploadProgress, loaded: 50, total: 100 });
    req.flush({ run: testRun({ state: 'queued', done: 0 }) }, { status: 202, statusText: 'Accepted' });
    const all = await events;
    expect(all.map((e) => e.type)).toContain(HttpEventType.UploadProgress);
    expect(all.at(-1)).toMatchObject({ type: HttpEventType.Response, status: 202, body: { run: { state: 'queued' } } });
  });

  it('lightCurveUploadBody: leaves out what the files say themselves (time system, value kind, target)', () => {
    const body = lightCurveUploadBody([file('c.csv')], { detrend: { offsets: 'node', clipSigma: null, binMinutes: 10 } });
    expect(body.has('timeSystem')).toBe(false);
    expect(body.has('valueKind')).toBe(false);
    expect(body.has('targetId')).toBe(false);
    expect(body.get('clipSigma')).toBe('');
    expect(body.get('binMinutes')).toBe('10');
  });

  it('reanalyse: POST …/analyses with the detrending choices', async () => {
    const answer = firstValueFrom(api.reanalyse(5, { offsets: 'none', clipSigma: 5, binMinutes: null }));
    const req = backend.expectOne({ method: 'POST', url: '/api/proposals/5/photometry/analyses' });
    expect(req.request.body).toEqual({ detrend: { offsets: 'none', clipSigma: 5, binMinutes: null } });
    req.flush({ run: testRun({ state: 'queued' }) }, { status: 202, statusText: 'Accepted' });
    expect((await answer).run.state).toBe('queued');
  });

  it('runStatus: GET …/run; exportUrl: the CSV download', async () => {
    const answer = firstValueFrom(api.runStatus(5));
    backend.expectOne({ method: 'GET', url: '/api/proposals/5/photometry/run' }).flush(testRun({ state: 'running', done: 1 }));
    expect((await answer).done).toBe(1);
    expect(api.exportUrl(5)).toBe('/api/proposals/5/photometry/export.csv');
  });
});
