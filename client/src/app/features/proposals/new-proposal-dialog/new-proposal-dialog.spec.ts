import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ApplicationRef } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { formatLocalInstant } from '../../../ui/time/date-format';
import { testCycle } from '../testing/fixtures';
import { NewProposalDialog } from './new-proposal-dialog';

describe('NewProposalDialog', () => {
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => {
    TestBed.inject(MatDialog).closeAll();
    backend.verify();
  });

  it('the chosen cycle’s deadline: UTC once, then the person’s own time only when it reads differently', async () => {
    TestBed.inject(MatDialog).open(NewProposalDialog);
    TestBed.tick();
    backend.expectOne('/api/cycles').flush([testCycle({ id: 11, status: 'open', callClosesAt: '2027-01-15T23:59:00Z' })]);
    await TestBed.inject(ApplicationRef).whenStable();
    const hint = (document.querySelector('[data-testid=closes-hint]')?.textContent ?? '').replace(/\s+/g, ' ').trim();
    const local = formatLocalInstant('2027-01-15T23:59:00Z', 'en-US');
    expect(hint).toBe(`Call closes 15 Jan 2027, 23:59 UTC${local && ` (your time: ${local})`}`);
  });
});
