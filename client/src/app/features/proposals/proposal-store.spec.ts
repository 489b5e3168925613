import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { createEnvironmentInjector, EnvironmentInjector } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { changedFields, ProposalStore } from './proposal-store';
import { testProposal } from './testing/fixtures';

describe('ProposalStore', () => {
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  it('changedFields: only what differs, node ids compared as a set', () => {
    const base = { title: 'A', abstract: 'x', category: null, nodeIds: [1, 2], completeness: 0.9 };
    expect(changedFields(base, { ...base, nodeIds: [2, 1] })).toEqual({});
    expect(changedFields(base, { ...base, abstract: 'y', category: 'Open clusters' })).toEqual({
      abstract: 'y',
      category: 'Open clusters',
    });
    expect(changedFields(base, { ...base, completeness: 0.95 })).toEqual({ completeness: 0.95 });
  });

  it('leaving the editor while an edit waits for its debounce sends it at once', async () => {
    const injector = createEnvironmentInjector([ProposalStore], TestBed.inject(EnvironmentInjector));
    const store = injector.get(ProposalStore);
    store.id.set(5);
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal());
    await Promise.resolve();
    store.rebase(testProposal());
    store.edit({
      title: 'Spin-down of the Lantern cluster',
      abstract: 'Typed just before leaving.',
      category: 'Open clusters',
      nodeIds: [1],
      completeness: 0.9,
    });
    backend.expectNone((req) => req.method === 'PATCH');

    injector.destroy();
    const patch = backend.expectOne((req) => req.method === 'PATCH' && req.url === '/api/proposals/5');
    expect(patch.request.body).toEqual({ version: 3, abstract: 'Typed just before leaving.' });
    patch.flush(testProposal({ version: 4 }));
  });

  it('an emptied title is held back (and said so) while the other changes save', async () => {
    const store = TestBed.runInInjectionContext(() => new ProposalStore());
    store.id.set(5);
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal());
    await Promise.resolve();
    store.rebase(testProposal());
    store.edit({
      title: '  ',
      abstract: 'Rotation periods of forty K dwarfs.',
      category: 'Open clusters',
      nodeIds: [1],
      completeness: 0.9,
    });
    store.flush();
    backend.expectNone((req) => req.method === 'PATCH');
    expect(store.saveState()).toBe('error');
    expect(store.saveError()?.message).toBe('Give the proposal a title to save it.');

    store.edit({ title: '  ', abstract: 'Changed.', category: 'Open clusters', nodeIds: [1], completeness: 0.9 });
    store.flush();
    expect(backend.expectOne((req) => req.method === 'PATCH').request.body).toEqual({ version: 3, abstract: 'Changed.' });
  });

  it('a completeness out of range or empty is held back (and said so) while the other changes save', async () => {
    const store = TestBed.runInInjectionContext(() => new ProposalStore());
    store.id.set(5);
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal());
    await Promise.resolve();
    store.rebase(testProposal());
    const values = {
      title: 'Spin-down of the Lantern cluster',
      abstract: 'Rotation periods of forty K dwarfs.',
      category: 'Open clusters',
      nodeIds: [1],
    };
    for (const completeness of [0.3, 1, null]) {
      store.edit({ ...values, completeness });
      store.flush();
      backend.expectNone((req) => req.method === 'PATCH');
      expect(store.saveState()).toBe('error');
      expect(store.saveError()?.message).toBe('Completeness must be between 50 % and 99 % to save it.');
    }

    store.edit({ ...values, abstract: 'Changed.', completeness: 0.3 });
    store.flush();
    expect(backend.expectOne((req) => req.method === 'PATCH').request.body).toEqual({ version: 3, abstract: 'Changed.' });
  });

  it('a valid completeness is sent as the fraction with the version read', async () => {
    const store = TestBed.runInInjectionContext(() => new ProposalStore());
    store.id.set(5);
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal());
    await Promise.resolve();
    store.rebase(testProposal());
    store.edit({
      title: 'Spin-down of the Lantern cluster',
      abstract: 'Rotation periods of forty K dwarfs.',
      category: 'Open clusters',
      nodeIds: [1],
      completeness: 0.95,
    });
    store.flush();
    const patch = backend.expectOne((req) => req.method === 'PATCH');
    expect(patch.request.body).toEqual({ version: 3, completeness: 0.95 });
    patch.flush(testProposal({ completeness: 0.95, version: 4 }));
    expect(store.saveState()).toBe('saved');
    expect(store.proposal()?.completeness).toBe(0.95);
  });
});
