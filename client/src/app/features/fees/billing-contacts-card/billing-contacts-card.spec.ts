import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { provideRouter } from '@angular/router';
import { testProgramBilling } from '../testing/fee-fixtures';
import { BillingContactsCard } from './billing-contacts-card';

const URL = '/api/billing/programs/5';

describe('BillingContactsCard', () => {
  let fixture: ComponentFixture<BillingContactsCard>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const q = (id: string) => el().querySelector(`[data-testid=${id}]`) as HTMLElement | null;
  const text = (id: string) => q(id)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
  const dialogButton = (label: string) =>
    [...document.querySelectorAll('mat-dialog-container button')].find((b) => b.textContent?.trim() === label) as HTMLButtonElement;
  const settle = async () => {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
  };

  async function render(respond: (req: ReturnType<HttpTestingController['expectOne']>) => void): Promise<void> {
    TestBed.configureTestingModule({
      imports: [BillingContactsCard],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(BillingContactsCard);
    fixture.componentRef.setInput('proposalId', 5);
    TestBed.tick();
    fixture.detectChanges();
    // Nothing at all while the answer is on its way.
    expect(q('billing-contacts-card')).toBeNull();
    respond(backend.expectOne(URL));
    await fixture.whenStable();
  }

  async function typeEmail(value: string): Promise<void> {
    const input = q('billing-contact-email') as HTMLInputElement;
    input.value = value;
    input.dispatchEvent(new Event('input'));
    await fixture.whenStable();
  }

  afterEach(() => {
    TestBed.inject(MatDialog).closeAll();
    backend.verify();
  });

  it('no program yet (404): no card at all', async () => {
    await render((req) => req.flush({ code: 'program_not_found', message: 'No program 5' }, { status: 404, statusText: 'Not Found' }));
    expect(q('billing-contacts-card')).toBeNull();
    expect(el().querySelector('[role=alert]')).toBeNull();
  });

  it('another failure: the error with Try again', async () => {
    await render((req) => req.flush({ code: 'x', message: 'Database asleep.' }, { status: 500, statusText: 'Error' }));
    expect(el().querySelector('[role=alert]')?.textContent).toContain('The billing contacts could not be loaded. Database asleep.');
  });

  it('lists accepted and invited contacts; the PI gets Remove buttons named after each address and the invite form', async () => {
    await render((req) => req.flush(testProgramBilling()));
    expect(text('billing-contact-4')).toContain('Bram Ledgerwood (ledger@greyhollow.example) · accepted 20 Feb 2027');
    expect(text('billing-contact-6')).toContain('accounts@fernwick.example · invited 3 Mar 2027, not accepted yet');
    expect(text('remove-contact-6')).toBe('Remove accounts@fernwick.example');
    expect(q('invite-billing-contact')).not.toBeNull();
  });

  it('a billing contact who is not the PI sees the list only', async () => {
    await render((req) => req.flush(testProgramBilling({ canManageContacts: false })));
    expect(q('remove-contact-4')).toBeNull();
    expect(q('invite-billing-contact')).toBeNull();
  });

  it('invite: a bad address is caught before sending; a good one is posted and the list updated', async () => {
    await render((req) => req.flush(testProgramBilling({ contacts: [] })));
    expect(text('no-billing-contacts')).toBe('No billing contact yet.');
    await typeEmail('not an address');
    (q('invite-billing-contact') as HTMLButtonElement).click();
    await fixture.whenStable();
    backend.expectNone(`${URL}/contacts`);
    expect(el().querySelector('mat-error')?.textContent?.trim()).toBe('must be an e-mail address');

    await typeEmail('accounts@fernwick.example');
    (q('invite-billing-contact') as HTMLButtonElement).click();
    const req = backend.expectOne(`${URL}/contacts`);
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ email: 'accounts@fernwick.example' });
    req.flush(testProgramBilling({ contacts: [testProgramBilling().contacts[1]] }), { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    expect(text('billing-contact-6')).toContain('accounts@fernwick.example');
    expect(text('billing-contacts-notice')).toBe(
      'Invitation sent to accounts@fernwick.example. They become a billing contact when they accept it.',
    );
    expect((q('billing-contact-email') as HTMLInputElement).value).toBe('');
  });

  it('invite refused with a field error: the message under the field', async () => {
    await render((req) => req.flush(testProgramBilling()));
    await typeEmail('ledger@greyhollow.example');
    (q('invite-billing-contact') as HTMLButtonElement).click();
    backend.expectOne(`${URL}/contacts`).flush(
      {
        code: 'already_contact',
        message: 'ledger@greyhollow.example is already a billing contact of this program.',
        fieldErrors: { email: ['already a billing contact'] },
      },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    expect(el().querySelector('mat-error')?.textContent?.trim()).toBe('already a billing contact');
    expect(q('billing-contacts-refusal')).toBeNull();
  });

  it('remove: asks first, then deletes and shows the list the server returns', async () => {
    await render((req) => req.flush(testProgramBilling()));
    (q('remove-contact-6') as HTMLButtonElement).click();
    await settle();
    expect(document.querySelector('mat-dialog-container')?.textContent).toContain('the invitation link stops working');
    dialogButton('Remove').click();
    await settle();
    const req = backend.expectOne(`${URL}/contacts/6`);
    expect(req.request.method).toBe('DELETE');
    req.flush(testProgramBilling({ contacts: [testProgramBilling().contacts[0]] }));
    await fixture.whenStable();
    expect(q('billing-contact-6')).toBeNull();
    expect(text('billing-contacts-notice')).toBe('accounts@fernwick.example is no longer a billing contact.');
  });
});
