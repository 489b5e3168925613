import { Marked } from 'marked';
import { forReaders } from './methods-text';

/** One parser for the page, GitHub-flavoured (tables), without the global marked options. */
const parser = new Marked({ gfm: true, breaks: false, async: false });

/**
 * The methods document as HTML. The `<a id="…"></a>` anchors of the Markdown pass through
 * unchanged, so `/methods#completeness` finds its section.
 */
export function renderMethodsMarkdown(markdown: string): string {
  // A wide table scrolls sideways on a phone (see the page's styles): focusable, so that a
  // keyboard can scroll it too.
  return parser.parse(forReaders(markdown), { async: false }).replace(/<table>/g, '<table tabindex="0">');
}
