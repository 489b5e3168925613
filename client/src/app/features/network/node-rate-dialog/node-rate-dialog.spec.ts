import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialog, MatDialogRef } from '@angular/material/dialog';
import type { TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { NORTH, testNode } from '../testing/network-fixtures';
import { NodeRateDialog, type NodeRateDialogData, type NodeRateDialogResult } from './node-rate-dialog';

describe('NodeRateDialog', () => {
  let backend: HttpTestingController;
  let ref: MatDialogRef<NodeRateDialog, NodeRateDialogResult>;
  let result: NodeRateDialogResult | 'open';

  const q = (id: string) => document.querySelector(`mat-dialog-container [data-testid=${id}]`) as HTMLElement | null;
  const field = () => q('external-rate') as HTMLInputElement;
  const stable = async () => {
    await new Promise((resolve) => setTimeout(resolve));
    TestBed.tick();
  };

  async function open(node: TelescopeNode): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    ref = TestBed.inject(MatDialog).open<NodeRateDialog, NodeRateDialogData, NodeRateDialogResult>(NodeRateDialog, { data: { node } });
    result = 'open';
    ref.afterClosed().subscribe((r) => (result = r));
    await stable();
  }

  async function type(value: string): Promise<void> {
    field().value = value;
    field().dispatchEvent(new Event('input'));
    await stable();
  }

  async function save(): Promise<void> {
    (q('node-rate-save') as HTMLButtonElement).click();
    await stable();
  }

  afterEach(() => {
    TestBed.inject(MatDialog).closeAll();
    backend.verify();
  });

  it('shows the academic rate beside the field, labelled with the currency, and the meaning of an empty field', async () => {
    await open(testNode(4, 'KRG-50', NORTH, { rateMinorPerHour: 4500, currency: 'eur', externalRateMinorPerHour: null }));
    expect(document.querySelector('mat-dialog-container h2')?.textContent).toBe('External rate of KRG-50');
    expect(q('academic-rate')?.textContent?.trim()).toBe('€45.00 per node-hour');
    const container = document.querySelector('mat-dialog-container') as HTMLElement;
    expect(container.querySelector('mat-label')?.textContent?.trim()).toBe('External rate per node-hour (EUR)');
    expect(container.textContent).toContain('Empty: external programs pay the academic rate.');
    expect(field().value).toBe('');
  });

  it('a stored rate is shown in the currency’s units; an edited one is sent in minor units and the saved node returned', async () => {
    const node = testNode(4, 'KRG-50', NORTH, { rateMinorPerHour: 4500, currency: 'eur', externalRateMinorPerHour: 7200 });
    await open(node);
    expect(field().value).toBe('72.00');
    await type('77.6');
    await save();
    const req = backend.expectOne('/api/nodes/4');
    expect(req.request.method).toBe('PATCH');
    expect(req.request.body).toEqual({ externalRateMinorPerHour: 7760 });
    const saved = { ...node, externalRateMinorPerHour: 7760 };
    req.flush(saved);
    await stable();
    expect(result).toEqual(saved);
  });

  it('emptying the field clears the rate (sends null); a currency without decimals is typed in whole units', async () => {
    await open(testNode(5, 'VHM-40', NORTH, { rateMinorPerHour: 720000, currency: 'jpy', externalRateMinorPerHour: 900000 }));
    expect(field().value).toBe('900000');
    await type('');
    await save();
    const req = backend.expectOne('/api/nodes/5');
    expect(req.request.body).toEqual({ externalRateMinorPerHour: null });
    req.flush(testNode(5, 'VHM-40', NORTH, { rateMinorPerHour: 720000, currency: 'jpy', externalRateMinorPerHour: null }));
    await stable();
    expect(result).toMatchObject({ id: 5, externalRateMinorPerHour: null });
  });

  it('a mistyped amount is explained under the field and nothing is sent', async () => {
    await open(testNode(4, 'KRG-50', NORTH, { currency: 'eur' }));
    await type('77,60');
    await save();
    expect(q('external-rate-error')?.textContent?.trim()).toBe('Give an amount in digits, e.g. 77.60');
    backend.expectNone('/api/nodes/4');
    expect(result).toBe('open');
  });

  it('a refusal by the server shows under the field (its fieldErrors) or in the dialog, which stays open', async () => {
    await open(testNode(4, 'KRG-50', NORTH, { currency: 'eur' }));
    await type('80');
    await save();
    backend.expectOne('/api/nodes/4').flush(
      {
        code: 'validation_failed',
        message: 'externalRateMinorPerHour: must be at most 2147483647',
        fieldErrors: { externalRateMinorPerHour: ['must be at most 2147483647'] },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await stable();
    expect(q('external-rate-error')?.textContent?.trim()).toBe('must be at most 2147483647');
    expect(q('dialog-error')).toBeNull();
    // The field's refusal holds it until it is edited: saving again unchanged sends nothing.
    await save();
    backend.expectNone('/api/nodes/4');
    await type('81');
    await save();
    backend
      .expectOne('/api/nodes/4')
      .flush({ code: 'forbidden', message: 'Only facility managers may do this.' }, { status: 403, statusText: 'Forbidden' });
    await stable();
    expect(q('dialog-error')?.textContent).toContain('Only facility managers may do this.');
    expect(result).toBe('open');
  });
});
