/**
 * JSON text of `object` with one more member whose value is JSON text already (e.g. rows read
 * from PostgreSQL as text): the big part is not parsed and stringified again. The caller
 * vouches that `valueJson` is valid JSON (it comes from our own serialisation).
 */
export function jsonWithRawMember(object: Record<string, unknown>, key: string, valueJson: string): string {
  if (Object.hasOwn(object, key)) throw new Error(`jsonWithRawMember: ${key} is already a member`);
  const head = JSON.stringify(object);
  if (!head.startsWith('{') || !head.endsWith('}')) throw new Error('jsonWithRawMember: not an object');
  return `${head.slice(0, -1)}${head.length > 2 ? ',' : ''}${JSON.stringify(key)}:${valueJson}}`;
}
