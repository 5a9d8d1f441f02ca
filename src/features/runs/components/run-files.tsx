import { formatBytes } from '../../../components/charts/format-units';
import { Empty } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { runFileUrl } from '../api/get-run-series';

/** The run's stored files with their SHA-256, each a download link. */
export function RunFiles({
  studioId,
  runId,
  files,
}: {
  studioId: string;
  runId: string;
  files: readonly { name: string; sha256: string; size_bytes: number }[];
}) {
  if (files.length === 0) return <Empty>No files stored for this run.</Empty>;
  return (
    <Table caption="Run files">
      <thead>
        <tr>
          <Th>File</Th>
          <Th className="text-right">Size</Th>
          <Th>SHA-256</Th>
        </tr>
      </thead>
      <tbody>
        {files.map((file) => (
          <tr key={file.name}>
            <Td>
              <a
                href={runFileUrl(studioId, runId, file.name)}
                download={file.name}
                className="font-mono text-xs text-tealdeep-600 underline"
              >
                {file.name}
              </a>
            </Td>
            <Td className="text-right font-mono text-xs whitespace-nowrap">{formatBytes(file.size_bytes)}</Td>
            <Td className="font-mono text-xs break-all text-ink-600">{file.sha256}</Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
