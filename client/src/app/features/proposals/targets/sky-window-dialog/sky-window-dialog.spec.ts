import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonToggleHarness } from '@angular/material/button-toggle/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MAT_DIALOG_DATA } from '@angular/material/dialog';
import type { SkyWindowsReport } from '@spincycle/shared/sky/sky-windows-report';
import { SkyWindowDialog, SkyWindowDialogData } from './sky-window-dialog';

function report(usableNights: number): SkyWindowsReport {
  return {
    site: { latitudeDeg: 28.76, longitudeDeg: -17.88, elevationM: 2326, timeZone: 'Atlantic/Canary' },
    limits: {
      altitudeLimitDeg: 30,
      geometricAltitudeLimitDeg: 29.97,
      sunAltitudeLimitDeg: -12,
      moonSeparationMinDeg: null,
      minUsableHours: 0,
      refraction: 'normal',
    },
    campaign: { firstNight: '2027-03-01', lastNight: '2027-03-02' },
    nights: [
      {
        nightDate: '2027-03-01',
        darkness: 'partial',
        darkStartUtc: '2027-03-01T19:40:00Z',
        darkEndUtc: '2027-03-02T06:10:00Z',
        darkHours: 10.5,
        moonIllumination: 0.4,
      },
      {
        nightDate: '2027-03-02',
        darkness: 'partial',
        darkStartUtc: '2027-03-02T19:41:00Z',
        darkEndUtc: '2027-03-03T06:09:00Z',
        darkHours: 10.47,
        moonIllumination: 0.5,
      },
    ],
    targets: [
      {
        name: 'Lantern 2',
        raDeg: 56.75,
        decDeg: 24.1167,
        summary: {
          firstUsableNight: '2027-03-01',
          lastUsableNight: '2027-03-02',
          usableNights,
          totalNights: 2,
          totalUsableHours: 7.5,
          maxNightlyUsableHours: 4,
          longestGapNights: 1,
          visibility: 'rises-and-sets',
        },
        nights: [
          {
            nightDate: '2027-03-01',
            darkStartUtc: null,
            darkEndUtc: null,
            usableHours: 3.5,
            intervals: [],
            altitudeAtMidDarkDeg: 50,
            moonSeparationDeg: 80,
            moonIllumination: 0.4,
          },
          {
            nightDate: '2027-03-02',
            darkStartUtc: null,
            darkEndUtc: null,
            usableHours: 4,
            intervals: [],
            altitudeAtMidDarkDeg: 49,
            moonSeparationDeg: 70,
            moonIllumination: 0.5,
          },
        ],
      },
    ],
  };
}

describe('SkyWindowDialog', () => {
  let fixture: ComponentFixture<SkyWindowDialog>;
  let backend: HttpTestingController;

  beforeEach(() => {
    const data: SkyWindowDialogData = {
      proposalId: 5,
      targetId: 2,
      targetName: 'Lantern 2',
      nodes: [
        { nodeId: 1, nodeCode: 'KRG-50' },
        { nodeId: 2, nodeCode: 'VHM-40' },
      ],
      nodeId: 2,
      verdicts: { 2: 'observable on 2 of 2 nights; cadence fits' },
    };
    TestBed.configureTestingModule({
      imports: [SkyWindowDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: data },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SkyWindowDialog);
    TestBed.tick();
  });

  afterEach(() => backend.verify());

  it('asks for the chosen node, draws the shared sky-window chart, and asks again for another node', async () => {
    const first = backend.expectOne((r) => r.url === '/api/proposals/5/targets/2/sky');
    expect(first.request.params.get('nodeId')).toBe('2');
    first.flush(report(2));
    await fixture.whenStable();
    const chart = fixture.nativeElement.querySelector('app-sky-window-chart') as HTMLElement;
    expect(chart.querySelector('h3')?.textContent).toBe('Lantern 2 from node VHM-40');
    expect(fixture.nativeElement.textContent).toContain('Target plan on VHM-40: observable on 2 of 2 nights; cadence fits.');
    expect(fixture.nativeElement.textContent).toContain("altitude limit of 30°, from the node's own safety configuration");

    const toggle = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatButtonToggleHarness.with({ text: 'KRG-50' }));
    expect(await toggle.isChecked()).toBe(false);
    // A native click: the harness would wait for stability, which the new request prevents.
    (await (await toggle.host()).getProperty<HTMLElement>('firstElementChild')).click();
    TestBed.tick();
    const second = backend.expectOne((r) => r.url === '/api/proposals/5/targets/2/sky');
    expect(second.request.params.get('nodeId')).toBe('1');
    second.flush(report(1));
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('app-sky-window-chart h3')?.textContent).toBe('Lantern 2 from node KRG-50');
  });
});
