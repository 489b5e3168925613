/** Reading the execution CSV: every bad row and field at once; structural problems at once. */
import { AppError } from '../../http/app-error';
import { readExecutionCsv } from './execution-csv';

const read = (text: string) => readExecutionCsv(Buffer.from(text, 'utf8'), 'log.csv');

describe('readExecutionCsv', () => {
  it('reads good rows (any column order, any case of status)', () => {
    const { rows, errors } = read(
      'status,utc_time,node,target\nDone,2027-03-04T02:15:00Z,N-1,Star A\nmissed,2027-03-04T03:00:00+01:00,N-1,Star B\n',
    );
    expect(errors).toEqual([]);
    expect(rows).toEqual([
      { row: 1, target: 'Star A', node: 'N-1', utcMs: Date.parse('2027-03-04T02:15:00Z'), status: 'done' },
      // 03:00 at +01:00 is 02:00 UTC (worked by hand in this test).
      { row: 2, target: 'Star B', node: 'N-1', utcMs: Date.parse('2027-03-04T02:00:00Z'), status: 'missed' },
    ]);
  });

  it('collects every problem of every row', () => {
    const { rows, errors } = read(
      'target,node,utc_time,status\n,N-1,2027-03-04 02:15,done\nStar B,,2027-03-04T02:15:00Z,planned\nStar C,N-1,2027-03-04T02:15:00Z,done\n',
    );
    expect(rows.map((r) => r.row)).toEqual([3]);
    expect(errors.map((e) => `${e.row}.${e.field}`)).toEqual(['1.target', '1.utc_time', '2.node', '2.status']);
  });

  it('refuses a file without the columns, naming the header', () => {
    expect(() => read('target,node,time\nStar A,N-1,2027-03-04T02:15:00Z\n')).toThrow(AppError);
    try {
      read('target,node,time\nStar A,N-1,2027-03-04T02:15:00Z\n');
    } catch (err) {
      expect((err as AppError).fieldErrors).toEqual({ header: ['header: missing columns utc_time, status'] });
    }
  });
});
