import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { SkyWindowsResponse } from '@spincycle/shared/planning/sky-windows-request';
import { firstValueFrom } from 'rxjs';
import { SkyWindowsApi } from './sky-windows-api';

describe('SkyWindowsApi', () => {
  it('compute: POSTs the request to /api/sky-windows and returns the response', async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    const backend = TestBed.inject(HttpTestingController);
    const request = { cycleId: 3, nodeIds: [1], targets: [{ name: 'Star A-17', ra: '12.5h', dec: '-05:20:30' }], includeNights: true };
    const answer = firstValueFrom(TestBed.inject(SkyWindowsApi).compute(request));
    const call = backend.expectOne('/api/sky-windows');
    expect(call.request.method).toBe('POST');
    expect(call.request.body).toEqual(request);
    const response: SkyWindowsResponse = {
      cycle: { id: 3, code: 'C3', campaignStart: '2027-01-01', campaignEnd: '2027-02-01' },
      nodes: [],
    };
    call.flush(response);
    expect(await answer).toEqual(response);
    backend.verify();
  });
});
