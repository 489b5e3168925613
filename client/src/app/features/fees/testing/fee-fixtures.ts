import {
  BILLING_CAUTION,
  type FeesSummary,
  type InvoiceDetail,
  type InvoiceSummary,
  type PaymentAttemptView,
  type ProgramBilling,
} from '@spincycle/shared/billing/billing';

/**
 * Invented invoices for the client tests. The lines are the hand-worked invoice of
 * shared/src/billing/billing.spec.ts: 12.50 h × 45.00 = 562.50, 7.25 h × 33.33 = 241.64,
 * 0.05 h × 0.10 = 0.01; total 804.15 (80 415 minor units).
 */
export function testInvoiceSummary(id: number, overrides: Partial<InvoiceSummary> = {}): InvoiceSummary {
  return {
    id,
    number: `SC-2027-${String(id).padStart(4, '0')}`,
    state: 'issued',
    proposalId: 50 + id,
    programTitle: `Program ${id}`,
    piName: 'Tamsin Orrel',
    cycleId: 7,
    cycleCode: '2027A',
    rateClass: 'academic',
    currency: 'EUR',
    totalMinor: 80_415,
    dueDate: '2027-04-01',
    issuedAt: '2027-03-02T09:00:00.000Z',
    paidAt: null,
    overdue: false,
    refundPending: false,
    version: 3,
    ...overrides,
  };
}

export function testAttempt(id: number, overrides: Partial<PaymentAttemptView> = {}): PaymentAttemptView {
  return {
    id,
    state: 'declined',
    message: 'Your card was declined.',
    cardBrand: 'Visa',
    cardLast4: '0002',
    amountMinor: 80_415,
    createdAt: '2027-03-05T10:15:00.000Z',
    ...overrides,
  };
}

export function testInvoice(id: number, overrides: Partial<InvoiceDetail> = {}): InvoiceDetail {
  return {
    ...testInvoiceSummary(id, { programTitle: 'Spin-down of an invented cluster' }),
    lines: [
      {
        position: 1,
        nodeId: 1,
        description: 'Node KRG-50 (Kestrel Ridge 50 cm), cycle 2027A',
        hoursHundredths: 1250,
        rateMinorPerHour: 4500,
        amountMinor: 56_250,
      },
      {
        position: 2,
        nodeId: 2,
        description: 'Node VHM-40 (Vale Hollow 40 cm), cycle 2027A',
        hoursHundredths: 725,
        rateMinorPerHour: 3333,
        amountMinor: 24_164,
      },
      {
        position: 3,
        nodeId: 3,
        description: 'Node QSP-30 (Quill Spur 30 cm), cycle 2027A',
        hoursHundredths: 5,
        rateMinorPerHour: 10,
        amountMinor: 1,
      },
    ],
    billTo: {
      programTitle: 'Spin-down of an invented cluster',
      piName: 'Tamsin Orrel',
      piAffiliation: 'Greyhollow Array',
      contacts: [
        {
          id: 4,
          email: 'ledger@greyhollow.example',
          name: 'Bram Ledgerwood',
          acceptedAt: '2027-02-20T08:00:00.000Z',
          invitedAt: '2027-02-19T08:00:00.000Z',
        },
      ],
    },
    payments: [],
    voidReason: null,
    refundReason: null,
    refundedAt: null,
    canPay: true,
    canManage: false,
    caution: BILLING_CAUTION,
    ...overrides,
  };
}

export function testFeesSummary(overrides: Partial<FeesSummary> = {}): FeesSummary {
  return {
    cycle: { id: 7, code: '2027A', title: 'Lantern season', awardsReleasedAt: '2027-03-01T12:00:00.000Z' },
    totals: [
      {
        currency: 'EUR',
        draftMinor: 50_000,
        issuedMinor: 260_415,
        paidMinor: 100_000,
        outstandingMinor: 80_415,
        overdueMinor: 30_000,
        refundedMinor: 80_000,
        invoices: 5,
      },
    ],
    invoices: [
      testInvoiceSummary(21, {
        number: null,
        state: 'draft',
        dueDate: null,
        issuedAt: null,
        programTitle: 'Dwarfs of the far field',
        version: 1,
      }),
      testInvoiceSummary(22, { programTitle: 'Spin-down of an invented cluster' }),
      testInvoiceSummary(23, {
        state: 'paid',
        paidAt: '2027-03-04T11:00:00.000Z',
        programTitle: 'Slow rotators, second season',
        totalMinor: 100_000,
      }),
    ],
    programsToInvoice: 2,
    rateCard: [
      { nodeId: 1, code: 'KRG-50', name: 'Kestrel Ridge 50 cm', currency: 'EUR', academicMinorPerHour: 4500, externalMinorPerHour: 9000 },
      { nodeId: 2, code: 'VHM-40', name: 'Vale Hollow 40 cm', currency: 'EUR', academicMinorPerHour: 3333, externalMinorPerHour: 3333 },
    ],
    ...overrides,
  };
}

export function testProgramBilling(overrides: Partial<ProgramBilling> = {}): ProgramBilling {
  return {
    proposalId: 5,
    programTitle: 'Spin-down of an invented cluster',
    rateClass: 'academic',
    contacts: [
      {
        id: 4,
        email: 'ledger@greyhollow.example',
        name: 'Bram Ledgerwood',
        acceptedAt: '2027-02-20T08:00:00.000Z',
        invitedAt: '2027-02-19T08:00:00.000Z',
      },
      { id: 6, email: 'accounts@fernwick.example', name: null, acceptedAt: null, invitedAt: '2027-03-03T08:00:00.000Z' },
    ],
    canManageContacts: true,
    ...overrides,
  };
}
