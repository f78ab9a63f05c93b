// Multipart uploads from the browser with progress (XMLHttpRequest reports upload progress; fetch
// does not), answering like `api()`: the parsed JSON, or an ApiCallError with the server's message.
import { ApiCallError } from "@/components/api";

export interface SendProgress {
  /** Bytes sent so far and in total (the total is 0 until the browser knows it). */
  sent: number;
  total: number;
  /** True once the whole body is sent and the server is working on it. */
  uploaded: boolean;
}

export function sendForm<T>(url: string, form: FormData, onProgress: (p: SendProgress) => void): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.responseType = "text";
    xhr.upload.onprogress = (e) =>
      onProgress({ sent: e.loaded, total: e.lengthComputable ? e.total : 0, uploaded: false });
    xhr.upload.onload = () => onProgress({ sent: 1, total: 1, uploaded: true });
    xhr.onerror = () => reject(new ApiCallError("The upload was interrupted; check the connection and try again.", 0));
    xhr.onload = () => {
      let body: { error?: { message?: string; path?: string } } | null = null;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        body = null;
      }
      if (xhr.status >= 200 && xhr.status < 300) resolve(body as T);
      else
        reject(
          new ApiCallError(body?.error?.message ?? `The server answered ${xhr.status}.`, xhr.status, body?.error?.path),
        );
    };
    xhr.send(form);
  });
}
