import { useId, useState, type ChangeEvent } from 'react';
import { useFormContext, useWatch, type FieldValues } from 'react-hook-form';
import type { AttachmentJson } from '../../../shared/schemas/attachments';
import { useUploadCertificate } from '../../api/lots/lots';
import { Button } from '../../components/ui/button';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { ApiError } from '../../lib/http';

/**
 * The supplier's certificate of conformance: uploaded the moment it is chosen and checked as a PDF
 * by its bytes, so a wrong file is refused at once; the form keeps only its id.
 */
export function CertificateField({ name }: { name: string }) {
  const id = useId();
  const { setValue } = useFormContext<FieldValues>();
  const chosen = useWatch({ name }) as number | null | undefined;
  const [file, setFile] = useState<AttachmentJson | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const upload = useUploadCertificate();

  const onFile = async (e: ChangeEvent<HTMLInputElement>) => {
    const f = e.target.files?.[0];
    e.target.value = '';
    if (!f) return;
    setProblem(null);
    try {
      const a = await upload.mutateAsync(f);
      setFile(a);
      setValue(name, a.id, { shouldDirty: true });
    } catch (err) {
      setProblem(`${f.name}: ${err instanceof ApiError ? err.message : 'it could not be uploaded. Try again.'}`);
    }
  };

  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={id} className="block text-sm font-medium text-ink floor:text-base">
        Certificate of conformance <span className="font-normal text-ink-faint">(optional)</span>
      </label>
      <div className="flex flex-wrap items-center gap-3">
        <input
          id={id}
          type="file"
          accept="application/pdf"
          onChange={(e) => void onFile(e)}
          aria-describedby={`${id}-hint`}
          className="block min-h-11 max-w-full rounded-control border border-rule-strong bg-field text-ink file:mr-3 file:min-h-11 file:cursor-pointer file:border-0 file:border-r file:border-rule-strong file:bg-sunk file:px-4 file:font-medium file:text-ink floor:min-h-12 floor:file:min-h-12"
        />
        <p id={`${id}-hint`} className="text-sm text-ink-faint">
          The supplier’s PDF, up to 8 MB.
        </p>
      </div>
      {upload.isPending && (
        <p role="status" className="text-ink-soft">
          Uploading the certificate…
        </p>
      )}
      {problem && (
        <Notice tone="bad" live="alert">
          {problem}
        </Notice>
      )}
      {file && chosen === file.id && (
        <p className="flex flex-wrap items-center gap-3">
          <Icon name="ok" size={18} className="text-ok" />
          <span className="font-mono">{file.fileName}</span> attached
          <Button size="sm" onClick={() => setValue(name, null, { shouldDirty: true })}>
            Remove
          </Button>
        </p>
      )}
    </div>
  );
}
