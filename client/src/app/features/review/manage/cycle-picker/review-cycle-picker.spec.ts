import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import ReviewCyclePicker from './review-cycle-picker';

describe('ReviewCyclePicker', () => {
  let fixture: ComponentFixture<ReviewCyclePicker>;
  let backend: HttpTestingController;

  function render(): void {
    TestBed.configureTestingModule({
      imports: [ReviewCyclePicker],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ReviewCyclePicker);
    TestBed.tick();
  }
  afterEach(() => backend.verify());
  const el = () => fixture.nativeElement as HTMLElement;

  it('lists the cycles with their call status, each a link to its review page', async () => {
    render();
    backend.expectOne('/api/cycles').flush([
      { id: 4, code: '2027B', title: 'Ember season', callClosesAt: '2027-01-16T00:00:00Z', status: 'closed' },
      { id: 3, code: '2027A', title: 'Lantern season', callClosesAt: '2027-06-16T00:00:00Z', status: 'open' },
    ]);
    await fixture.whenStable();
    const links = [...el().querySelectorAll('[data-testid=cycle-list] a')] as HTMLAnchorElement[];
    expect(links.map((a) => a.getAttribute('href'))).toEqual(['/review/manage/4', '/review/manage/3']);
    expect(links[0].textContent).toContain('2027B · Ember season');
    expect(links[0].textContent).toContain('call closed; closes 16 Jan 2027, 00:00 UTC');
    expect(links[1].textContent).toContain('call open; closes 16 Jun 2027, 00:00 UTC');
  });

  it('empty: says there are no cycles', async () => {
    render();
    backend.expectOne('/api/cycles').flush([]);
    await fixture.whenStable();
    expect(el().textContent).toContain('There are no cycles yet.');
  });

  it('error: the message', async () => {
    render();
    backend.expectOne('/api/cycles').flush({ code: 'x', message: 'Database asleep' }, { status: 503, statusText: 'Unavailable' });
    await fixture.whenStable();
    expect(el().textContent).toContain('The cycles could not be loaded.');
  });
});
