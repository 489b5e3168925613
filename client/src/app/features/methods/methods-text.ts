/**
 * The document names each quantity's code key beside its label, `**Visits** (\`visits\`)`, for
 * developers and for the test that holds the document to the code; readers of the page see
 * the label alone.
 */
export function forReaders(markdown: string): string {
  return markdown.replace(/(\*\*[^*]+\*\*)\s*\(`[A-Za-z][A-Za-z0-9]*`\)/g, '$1');
}
