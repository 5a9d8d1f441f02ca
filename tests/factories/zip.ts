// Reading zips in tests with a general-purpose library (yauzl), independently of the code that wrote
// them (yazl in the package builder).
import yauzl from 'yauzl';

/** Every entry of the zip in order, with its name and bytes. */
export function zipEntries(zip: Buffer): Promise<{ name: string; data: Buffer }[]> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(zip, { lazyEntries: true }, (err, zf) => {
      if (err || !zf) return reject(err ?? new Error('not a zip'));
      const out: { name: string; data: Buffer }[] = [];
      zf.on('error', reject);
      zf.on('entry', (entry: yauzl.Entry) => {
        zf.openReadStream(entry, (e, s) => {
          if (e || !s) return reject(e ?? new Error(`cannot read ${entry.fileName}`));
          const chunks: Buffer[] = [];
          s.on('data', (c: Buffer) => chunks.push(c));
          s.on('error', reject);
          s.on('end', () => {
            out.push({ name: entry.fileName, data: Buffer.concat(chunks) });
            zf.readEntry();
          });
        });
      });
      zf.on('end', () => resolve(out));
      zf.readEntry();
    });
  });
}

/** The zip's entries by name. */
export async function unzip(zip: Buffer): Promise<Map<string, Buffer>> {
  return new Map((await zipEntries(zip)).map((e) => [e.name, e.data]));
}
