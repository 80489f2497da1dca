import { apiBlob } from './client';

export const CAN_DOWNLOAD = true;

/**
 * Saves a signed-in file (the log PDF). A plain link cannot carry the bearer token, so the file is fetched
 * with it, turned into a blob URL, and handed to a temporary `<a download>` — the browser saves it under
 * `filename` instead of navigating away from the app.
 */
export async function downloadFromApi(path: string, filename: string): Promise<void> {
  const blob = await apiBlob(path);
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = filename;
  a.rel = 'noopener';
  document.body.appendChild(a);
  a.click();
  a.remove();
  // Revoked on the next turn: revoking at once can cancel the download in some browsers.
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
