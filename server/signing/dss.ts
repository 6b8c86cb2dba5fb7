// PAdES B-LT: the document security store (ISO 32000-2 §12.8.4.3, ETSI EN 319 142-1) written as an
// incremental update after the signature, so the signed bytes stay untouched. It holds the
// certificates of the signer's and the TSA's chains and the CRLs that cover them, so the signature
// can be validated later without asking anyone.
//
// Written by hand because the update is small and fixed: a handful of stream objects, the /DSS
// dictionary, the catalog again with /DSS, and a classic cross-reference section (the renderer
// writes classic cross-reference tables, so the update uses one too).

export interface ValidationData {
  certificates: Uint8Array[];
  crls: Uint8Array[];
}

interface Trailer {
  size: number;
  root: number;
  rest: string;
  startxref: number;
}

function lastTrailer(text: string): Trailer {
  const at = text.lastIndexOf('trailer');
  const startAt = text.lastIndexOf('startxref');
  if (at < 0 || startAt < at) throw new Error('The PDF has no classic trailer to append a security store to.');
  const dict = text.slice(at + 'trailer'.length, startAt);
  const size = /\/Size\s+(\d+)/.exec(dict);
  const root = /\/Root\s+(\d+)\s+0\s+R/.exec(dict);
  const startxref = /startxref\s+(\d+)/.exec(text.slice(startAt));
  if (!size || !root || !startxref) throw new Error('The PDF trailer lacks /Size, /Root or startxref.');
  const info = /\/Info\s+\d+\s+0\s+R/.exec(dict)?.[0] ?? '';
  const id = /\/ID\s*\[[^\]]*\]/.exec(dict)?.[0] ?? '';
  return { size: Number(size[1]), root: Number(root[1]), rest: [info, id].filter(Boolean).join('\n'), startxref: Number(startxref[1]) };
}

/** The body of the newest definition of object `num` (between "obj" and "endobj"). */
function objectBody(text: string, num: number): string {
  const pattern = new RegExp(`(?:^|[\\r\\n])${num} 0 obj\\s*([\\s\\S]*?)endobj`, 'g');
  let body: string | null = null;
  for (let m = pattern.exec(text); m; m = pattern.exec(text)) body = m[1];
  if (body === null) throw new Error(`The PDF has no object ${num}.`);
  return body.trim();
}

export function appendDss(pdf: Buffer, data: ValidationData): Buffer {
  const text = pdf.toString('latin1');
  const trailer = lastTrailer(text);
  const catalog = objectBody(text, trailer.root);
  if (!catalog.startsWith('<<') || !catalog.endsWith('>>')) throw new Error('The PDF catalog is not a plain dictionary.');

  const parts: Buffer[] = [pdf];
  let offset = pdf.length;
  if (!text.endsWith('\n')) {
    parts.push(Buffer.from('\n'));
    offset += 1;
  }
  const offsets: Array<[number, number]> = [];
  let next = trailer.size;
  const write = (num: number, head: string, stream?: Uint8Array) => {
    offsets.push([num, offset]);
    const chunk = stream
      ? Buffer.concat([Buffer.from(`${num} 0 obj\n${head}\nstream\n`, 'latin1'), Buffer.from(stream), Buffer.from('\nendstream\nendobj\n', 'latin1')])
      : Buffer.from(`${num} 0 obj\n${head}\nendobj\n`, 'latin1');
    parts.push(chunk);
    offset += chunk.length;
  };
  const streams = (list: Uint8Array[]) =>
    list.map((bytes) => {
      const num = next++;
      write(num, `<< /Length ${bytes.length} >>`, bytes);
      return `${num} 0 R`;
    });
  const certs = streams(data.certificates);
  const crls = streams(data.crls);
  const dss = next++;
  write(dss, `<< /Type /DSS /Certs [${certs.join(' ')}]${crls.length ? ` /CRLs [${crls.join(' ')}]` : ''} >>`);
  const withoutDss = catalog
    .slice(0, -2)
    .replace(/\/DSS\s+\d+\s+0\s+R/, '')
    .trimEnd();
  write(trailer.root, `${withoutDss}\n/DSS ${dss} 0 R\n>>`);

  const xref = offset;
  const entry = (at: number) => `${String(at).padStart(10, '0')} 00000 n \n`;
  const sections = offsets
    .sort((a, b) => a[0] - b[0])
    .reduce<Array<Array<[number, number]>>>((runs, item) => {
      const run = runs[runs.length - 1];
      if (run && run[run.length - 1][0] + 1 === item[0]) run.push(item);
      else runs.push([item]);
      return runs;
    }, [])
    .map((run) => `${run[0][0]} ${run.length}\n${run.map(([, at]) => entry(at)).join('')}`)
    .join('');
  parts.push(
    Buffer.from(
      `xref\n${sections}trailer\n<<\n/Size ${next}\n/Root ${trailer.root} 0 R\n${trailer.rest ? `${trailer.rest}\n` : ''}/Prev ${trailer.startxref}\n>>\nstartxref\n${xref}\n%%EOF\n`,
      'latin1',
    ),
  );
  return Buffer.concat(parts);
}
