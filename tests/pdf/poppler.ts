// Runs the independent PDF tools (poppler-utils, qpdf) on a file and returns what they print.
// pdfsig exits 0 even when a signature is broken, so callers read its output, never its exit code.
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';

const run = promisify(execFile);

export interface ToolOutput {
  code: number;
  stdout: string;
  stderr: string;
}

export async function tool(command: string, args: string[]): Promise<ToolOutput> {
  try {
    const { stdout, stderr } = await run(command, args, { maxBuffer: 64 * 1024 * 1024 });
    return { code: 0, stdout, stderr };
  } catch (error) {
    const e = error as { code?: number; stdout?: string; stderr?: string };
    if (typeof e.code !== 'number') throw error;
    return { code: e.code, stdout: e.stdout ?? '', stderr: e.stderr ?? '' };
  }
}

/** With `nssdir`, pdfsig validates certificates against the roots imported into that NSS database. */
export const pdfsig = (file: string, nssdir?: string) => tool('pdfsig', [...(nssdir ? ['-nssdir', `sql:${nssdir}`] : []), file]);
export const qpdfCheck = (file: string) => tool('qpdf', ['--check', file]);
export const pdfinfo = (file: string) => tool('pdfinfo', [file]);

/** Text of one page (1-based) or of the whole file, in content-stream order (-raw). */
export async function pdftext(file: string, page?: number): Promise<string> {
  const range = page === undefined ? [] : ['-f', String(page), '-l', String(page)];
  const out = await tool('pdftotext', ['-raw', '-enc', 'UTF-8', ...range, file, '-']);
  if (out.code !== 0) throw new Error(`pdftotext failed: ${out.stderr}`);
  return out.stdout;
}

/** Whitespace (line breaks from wrapping included) folded to single spaces. */
export const flat = (text: string) => text.replace(/\s+/g, ' ').trim();

export async function pageCount(file: string): Promise<number> {
  const out = await pdfinfo(file);
  const match = /^Pages:\s+(\d+)/m.exec(out.stdout);
  if (!match) throw new Error(`pdfinfo gave no page count: ${out.stdout}${out.stderr}`);
  return Number(match[1]);
}

/** Renders one page to `${prefix}.png` at the given resolution. */
export async function renderPage(file: string, page: number, prefix: string, dpi = 110): Promise<ToolOutput> {
  return tool('pdftoppm', ['-png', '-r', String(dpi), '-f', String(page), '-l', String(page), '-singlefile', file, prefix]);
}
