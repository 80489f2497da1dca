// Native builds have no file-saving module yet (Fieldfold ships on the web first; see download.web.ts).
export const CAN_DOWNLOAD = false;

export async function downloadFromApi(_path: string, _filename: string): Promise<void> {
  throw new Error('Saving PDFs works in the web app for now: open Fieldfold in a browser to download the log.');
}
