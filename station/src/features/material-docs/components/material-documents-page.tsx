import {
  documentKindSchema,
  materialSchema,
  MAX_DOCUMENT_BYTES,
  type DocumentKind,
} from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { SelectField } from '../../../components/form/field';
import { apiRequest } from '../../../lib/api-client';
import { hasRole, useSession } from '../../../lib/auth';
import { useMaterialDocuments } from '../../../lib/material-documents';
import { useUploadDocument } from '../api/upload-document';

const KIND_SHOWN: Record<DocumentKind, string> = {
  sds: 'Safety data sheet',
  tds: 'Technical data sheet',
};

const size = (bytes: number) =>
  bytes < 1024 * 1024 ? `${Math.ceil(bytes / 1024)} kB` : `${(bytes / 1024 / 1024).toFixed(1)} MB`;

/**
 * `/materials/:materialId/documents`: a material's data sheets, every version with its upload
 * date (the newest of each kind is the one the bench opens), and for leads an upload form.
 */
export function MaterialDocumentsPage() {
  const { materialId = '' } = useParams();
  const material = useQuery({
    queryKey: ['materials', materialId],
    queryFn: () => apiRequest(`/materials/${encodeURIComponent(materialId)}`, materialSchema),
  });
  const documents = useMaterialDocuments(materialId);
  const mayUpload = hasRole(useSession(), ['lead', 'admin']);
  return (
    <section aria-labelledby="docs-title" className="mx-auto max-w-5xl">
      {mayUpload && (
        <p className="text-lg">
          <Link className="underline" to="/materials">
            Materials, lots and stock
          </Link>
        </p>
      )}
      <h1 id="docs-title" className="text-3xl font-bold">
        Data sheets{material.data ? `: ${material.data.name}` : ''}
      </h1>
      {material.error && <p role="alert">{material.error.message}</p>}
      {mayUpload && <UploadForm materialId={materialId} />}
      <h2 className="mt-8 text-2xl font-bold">Versions</h2>
      {documents.isPending && <p className="text-lg text-muted">Loading…</p>}
      {documents.data?.length === 0 && <p className="mt-2 text-lg">No sheet is uploaded yet.</p>}
      {documents.data && documents.data.length > 0 && (
        <table className="mt-3 w-full text-left text-lg">
          <thead>
            <tr className="border-b-2 border-line">
              <th className="py-2">Sheet</th>
              <th>File</th>
              <th>Uploaded</th>
              <th>By</th>
            </tr>
          </thead>
          <tbody>
            {documents.data.map((d) => (
              <tr key={d.id} className="border-b border-line">
                <td className="py-2">{KIND_SHOWN[d.kind]}</td>
                <td>
                  <a className="underline" href={d.openUrl} target="_blank" rel="noopener">
                    {d.fileName}
                  </a>{' '}
                  <span className="text-muted">({size(d.sizeBytes)})</span>
                </td>
                <td>{new Date(d.uploadedAt).toLocaleString()}</td>
                <td>{d.uploadedBy.name}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}

function UploadForm({ materialId }: { materialId: string }) {
  const upload = useUploadDocument(materialId);
  const [kind, setKind] = useState<DocumentKind>('sds');
  const [file, setFile] = useState<File | null>(null);
  const tooLarge = !!file && file.size > MAX_DOCUMENT_BYTES;
  return (
    <form
      aria-label="Upload a data sheet"
      className="mt-6 flex flex-wrap items-end gap-4 rounded-xl bg-panel p-4 ring-1 ring-line"
      onSubmit={(e) => {
        e.preventDefault();
        if (file && !tooLarge) {
          upload.mutate({ kind, file }, { onSuccess: () => (e.target as HTMLFormElement).reset() });
        }
      }}
    >
      <SelectField
        label="Sheet"
        value={kind}
        onPick={(v) => setKind(documentKindSchema.catch('sds').parse(v))}
        options={[
          { value: 'sds', label: KIND_SHOWN.sds },
          { value: 'tds', label: KIND_SHOWN.tds },
        ]}
      />
      <label className="flex flex-col gap-1 text-lg font-semibold">
        PDF file (at most 20 MB)
        <input
          type="file"
          accept="application/pdf,.pdf"
          onChange={(e) => setFile(e.target.files?.[0] ?? null)}
          className="text-lg font-normal"
        />
      </label>
      <button
        type="submit"
        disabled={!file || tooLarge || upload.isPending}
        className="min-h-14 rounded-xl bg-steel px-6 text-xl font-semibold text-paper disabled:bg-line disabled:text-muted"
      >
        {upload.isPending ? 'Uploading…' : 'Upload'}
      </button>
      {tooLarge && (
        <p className="w-full text-lg font-semibold text-over">The file is over 20 MB.</p>
      )}
      {upload.error && (
        <p role="alert" className="w-full text-lg font-semibold text-over">
          {upload.error.message}
        </p>
      )}
      {upload.isSuccess && <p className="w-full text-lg">Uploaded.</p>}
    </form>
  );
}
