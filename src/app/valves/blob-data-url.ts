import { Observable } from 'rxjs';

/**
 * A blob as a data: URL. The hub's content policy allows images from 'self' and data: only, so
 * an object (blob:) URL of an image fetched with the bearer header would be blocked.
 */
export function blobDataUrl(blob: Blob): Observable<string> {
  return new Observable<string>((subscriber) => {
    const reader = new FileReader();
    reader.onload = () => {
      subscriber.next(reader.result as string);
      subscriber.complete();
    };
    reader.onerror = () => subscriber.error(reader.error);
    reader.readAsDataURL(blob);
    return () => reader.abort();
  });
}
