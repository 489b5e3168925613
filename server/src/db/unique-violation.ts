/** PostgreSQL's SQLSTATE for a unique constraint or index refusing a row. */
const UNIQUE_VIOLATION = '23505';

/** Whether a query failed on a unique constraint (e.g. a taken e-mail, cycle code or target name). */
export function isUniqueViolation(err: unknown): boolean {
  return (err as { code?: string } | null)?.code === UNIQUE_VIOLATION;
}
