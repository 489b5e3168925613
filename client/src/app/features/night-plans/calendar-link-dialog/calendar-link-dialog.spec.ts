import { Clipboard } from '@angular/cdk/clipboard';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import type { CalendarFeedLink, CalendarFeedStatus } from '@spincycle/shared/night-plans/night-plans';
import { CalendarLinkDialog, type CalendarLinkDialogData } from './calendar-link-dialog';

const DATA: CalendarLinkDialogData = { cycleId: 7, nodeId: 3, nodeCode: 'KRG-50' };
const FEED = '/api/night-plans/cycles/7/nodes/3/calendar-feed';
const NONE: CalendarFeedStatus = { active: false, createdAt: null, createdBy: null };
const WORKING: CalendarFeedStatus = { active: true, createdAt: '2027-02-20T09:00:00Z', createdBy: 'Ines Okafor-Lind' };
const LINK: CalendarFeedLink = {
  url: 'https://spincycle.example/api/calendar-feeds/AbCdEfGhIjKlMnOpQrStUvWxYz0123456789-_abcde.ics',
  createdAt: '2027-02-21T10:30:00Z',
};

describe('CalendarLinkDialog', () => {
  let fixture: ComponentFixture<CalendarLinkDialog>;
  let backend: HttpTestingController;
  const copy = jest.fn<boolean, [string]>();
  const el = () => fixture.nativeElement as HTMLElement;
  const text = (sel: string) => el().querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;
  const button = (id: string) => el().querySelector(`[data-testid=${id}]`) as HTMLButtonElement | null;
  const turn = () => new Promise((resolve) => setTimeout(resolve));
  /** Not whenStable: a pending read holds it off until answered. */
  async function settle(): Promise<void> {
    await turn();
    TestBed.tick();
    await turn();
    TestBed.tick();
  }
  async function click(id: string): Promise<void> {
    button(id)!.click();
    await settle();
  }

  async function open(status: CalendarFeedStatus): Promise<void> {
    copy.mockReset();
    TestBed.configureTestingModule({
      imports: [CalendarLinkDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: DATA },
        { provide: MatDialogRef, useValue: { close: jest.fn() } },
        { provide: Clipboard, useValue: { copy } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CalendarLinkDialog);
    TestBed.tick();
    const read = backend.expectOne(FEED);
    expect(read.request.method).toBe('GET');
    read.flush(status);
    await settle();
  }
  afterEach(() => backend.verify());

  it('no link yet: says so in words, offers "Make a link", no stop and no warning', async () => {
    await open(NONE);
    expect(text('[data-testid=link-state] span')).toBe('There is no working link: no calendar can subscribe to the plan of KRG-50.');
    expect(text('[data-testid=make-link]')).toBe('add_link Make a link');
    expect(button('stop-link')).toBeNull();
    expect(el().querySelector('[data-testid=make-warning]')).toBeNull();
    expect(el().querySelector('[data-testid=new-link]')).toBeNull();
  });

  it('a working link: made when and by whom, and the warning that a new link stops it, tied to the button', async () => {
    await open(WORKING);
    expect(text('[data-testid=link-state] span')).toBe('A link works: made 20 Feb 2027, 09:00 UTC by Ines Okafor-Lind.');
    expect(text('[data-testid=make-link]')).toBe('add_link Make a new link');
    expect(button('make-link')!.getAttribute('aria-describedby')).toBe('make-warning');
    expect(text('#make-warning')).toContain('Making a new link stops the link that works now');
    expect(button('stop-link')).not.toBeNull();
    // The link itself is never shown for a link made earlier.
    expect(el().querySelector('[data-testid=new-link-url]')).toBeNull();
  });

  it('a link made by someone no longer registered says so', async () => {
    await open({ ...WORKING, createdBy: null });
    expect(text('[data-testid=link-state]')).toContain('by someone who is no longer registered.');
  });

  it('makes a first link at once, shows it once in a read-only labelled field, copies it, and reads the state again', async () => {
    await open(NONE);
    await click('make-link');
    const post = backend.expectOne(FEED);
    expect(post.request.method).toBe('POST');
    post.flush(LINK);
    await settle();
    backend.expectOne(FEED).flush({ active: true, createdAt: LINK.createdAt, createdBy: 'Ines Okafor-Lind' });
    await settle();

    const input = el().querySelector('[data-testid=new-link-url]') as HTMLInputElement;
    expect(input.value).toBe(LINK.url);
    expect(input.readOnly).toBe(true);
    expect(el().querySelector(`label[for="${input.id}"]`)?.textContent).toContain('Subscription link of KRG-50');
    expect(text('#new-link-once')).toContain('this link will not be shown again');
    expect(document.activeElement).toBe(input);
    expect(text('[data-testid=link-state]')).toContain('A link works: made 21 Feb 2027, 10:30 UTC by Ines Okafor-Lind.');

    copy.mockReturnValue(true);
    await click('copy-link');
    expect(copy).toHaveBeenCalledWith(LINK.url);
    expect(text('[data-testid=copy-result]')).toBe('The link is copied.');
    copy.mockReturnValue(false);
    await click('copy-link');
    expect(text('[data-testid=copy-result]')).toBe('The link could not be copied: select it and copy it yourself.');
  });

  it('with a working link, "Make a new link" asks first; keeping it sends nothing, confirming makes the new one', async () => {
    await open(WORKING);
    await click('make-link');
    expect(text('[data-testid=confirm]')).toContain('The link that works now stops working at once');
    expect(document.activeElement).toBe(button('confirm-yes'));
    backend.expectNone(FEED);

    await click('confirm-cancel');
    expect(el().querySelector('[data-testid=confirm]')).toBeNull();
    expect(document.activeElement).toBe(button('make-link'));
    backend.expectNone(FEED);

    await click('make-link');
    expect(text('[data-testid=confirm-yes]')).toBe('Make a new link and stop the current one');
    await click('confirm-yes');
    const post = backend.expectOne(FEED);
    expect(post.request.method).toBe('POST');
    post.flush(LINK);
    await settle();
    backend.expectOne(FEED).flush({ active: true, createdAt: LINK.createdAt, createdBy: 'Ines Okafor-Lind' });
    await settle();
    expect(el().querySelector('[data-testid=confirm]')).toBeNull();
    expect((el().querySelector('[data-testid=new-link-url]') as HTMLInputElement).value).toBe(LINK.url);
  });

  it('"Stop the link" asks first, then stops it: the state reads "no working link" and the new link is gone', async () => {
    await open(NONE);
    await click('make-link');
    backend.expectOne(FEED).flush(LINK);
    await settle();
    backend.expectOne(FEED).flush({ active: true, createdAt: LINK.createdAt, createdBy: 'Ines Okafor-Lind' });
    await settle();

    await click('stop-link');
    expect(text('[data-testid=confirm]')).toContain('nobody can subscribe until you make a new link');
    backend.expectNone(FEED);
    await click('confirm-yes');
    const del = backend.expectOne(FEED);
    expect(del.request.method).toBe('DELETE');
    del.flush(null, { status: 204, statusText: 'No Content' });
    await settle();
    backend.expectOne(FEED).flush(NONE);
    await settle();
    expect(el().querySelector('[data-testid=new-link]')).toBeNull();
    expect(text('[data-testid=link-state]')).toContain('There is no working link');
    expect(button('stop-link')).toBeNull();
  });

  it('a refused change says why in the dialog; a failed read says so with a retry', async () => {
    await open(NONE);
    await click('make-link');
    backend.expectOne(FEED).flush({ code: 'node_not_found', message: 'No node 3 in this cycle' }, { status: 404, statusText: 'Not Found' });
    await settle();
    expect(text('[data-testid=link-error]')).toBe('The new link was not made. No node 3 in this cycle');
    expect(el().querySelector('[data-testid=new-link]')).toBeNull();

    TestBed.resetTestingModule();
    copy.mockReset();
    TestBed.configureTestingModule({
      imports: [CalendarLinkDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: DATA },
        { provide: Clipboard, useValue: { copy } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CalendarLinkDialog);
    TestBed.tick();
    backend.expectOne(FEED).flush({ code: 'server_error', message: 'Try again later.' }, { status: 503, statusText: 'Unavailable' });
    await settle();
    expect(text('[role=alert]')).toContain('The subscription link could not be loaded. Try again later.');
    expect(button('make-link')!.disabled).toBe(true);
    const retry = [...el().querySelectorAll('app-load-status button')].find((b) =>
      b.textContent?.includes('Try again'),
    ) as HTMLButtonElement;
    retry.click();
    await settle();
    backend.expectOne(FEED).flush(NONE);
    await settle();
    expect(text('[data-testid=link-state]')).toContain('There is no working link');
  });
});
