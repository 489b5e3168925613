import { httpResource } from '@angular/common/http';
import { Injectable } from '@angular/core';

/**
 * URL of docs/science.md as the build ships it (angular.json copies it under assets/; not
 * under /methods/, where the static server would answer the page's own URL with a redirect to
 * the directory).
 */
export const METHODS_DOCUMENT_URL = '/assets/methods/science.md';

/** All HTTP of the methods feature. */
@Injectable({ providedIn: 'root' })
export class MethodsApi {
  /** The methods document as Markdown text. Call from an injection context (a component field). */
  documentResource() {
    return httpResource.text(() => METHODS_DOCUMENT_URL);
  }
}
