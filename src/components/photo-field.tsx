import { useId, useState, type ChangeEvent } from 'react';
import { useFormContext, useWatch, type FieldValues } from 'react-hook-form';
import { useUploadPhoto, type Attachment } from '../api/attachments/upload-photo';
import { ApiError } from '../lib/http';
import { useT } from '../lib/i18n';
import { Button } from './ui/button';
import { Icon } from './ui/icon';
import { Notice } from './ui/notice';

type PhotoFieldProps = {
  name: string;
  label: string;
  max: number;
  hint?: string;
  /** PDFs too, where the record takes documents (a corrective action's evidence). */
  documents?: boolean;
};

/**
 * Photos go up the moment they are chosen (a tablet camera shot can be large, and the dock should
 * see a refusal at once, not on submit). The form keeps only their ids; the thumbnails are kept here.
 */
export function PhotoField({ name, label, max, hint, documents = false }: PhotoFieldProps) {
  const id = useId();
  const t = useT();
  const { getValues, setValue } = useFormContext<FieldValues>();
  const ids = (useWatch({ name }) as number[] | undefined) ?? [];
  const [photos, setPhotos] = useState<Attachment[]>([]);
  const [uploading, setUploading] = useState(0);
  const [problems, setProblems] = useState<string[]>([]);
  const upload = useUploadPhoto();
  const shown = photos.filter((p) => ids.includes(p.id));
  const room = max - ids.length;

  const onFiles = async (e: ChangeEvent<HTMLInputElement>) => {
    const files = [...(e.target.files ?? [])];
    e.target.value = ''; // the same photo may be chosen again after a refusal
    setProblems([]);
    const take = files.slice(0, Math.max(room, 0));
    const over = files.length - take.length;
    if (over > 0) setProblems([t('photos.over', { max, over })]);
    setUploading((n) => n + take.length);
    await Promise.all(
      take.map(async (file) => {
        try {
          const a = await upload.mutateAsync(file);
          setPhotos((p) => [...p, a]);
          setValue(name, [...((getValues(name) as number[] | undefined) ?? []), a.id], { shouldDirty: true });
        } catch (err) {
          const why = err instanceof ApiError ? err.message : t('photos.uploadFailed');
          setProblems((p) => [...p, `${file.name}: ${why}`]);
        } finally {
          setUploading((n) => n - 1);
        }
      }),
    );
  };

  const remove = (photoId: number) =>
    setValue(
      name,
      ((getValues(name) as number[] | undefined) ?? []).filter((x) => x !== photoId),
      { shouldDirty: true },
    );

  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={id} className="block text-sm font-medium text-ink floor:text-base">
        {label}
      </label>
      <div className="flex flex-wrap items-center gap-3">
        <input
          id={id}
          type="file"
          accept={documents ? 'image/*,application/pdf' : 'image/*'}
          capture={documents ? undefined : 'environment'}
          multiple
          disabled={room <= 0}
          onChange={(e) => void onFiles(e)}
          aria-describedby={`${id}-hint`}
          className="block min-h-11 floor:min-h-12 max-w-full rounded-control border border-rule-strong bg-field text-ink file:mr-3 file:min-h-11 floor:file:min-h-12 file:cursor-pointer file:border-0 file:border-r file:border-rule-strong file:bg-sunk file:px-4 file:font-medium file:text-ink hover:file:bg-ground-deep/40 disabled:opacity-55"
        />
        <p id={`${id}-hint`} className="text-sm text-ink-faint">
          {hint ?? t('photos.hint')}{' '}
          <span className="font-mono">
            {ids.length}/{max}
          </span>{' '}
          {t('photos.attached')}
        </p>
      </div>
      {uploading > 0 && (
        <p role="status" className="text-ink-soft">
          {t('photos.uploading', { count: uploading })}
        </p>
      )}
      {problems.length > 0 && (
        <Notice tone="bad" live="alert" title={t('photos.notAll')}>
          <ul className="list-disc pl-5">
            {problems.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        </Notice>
      )}
      {shown.length > 0 && (
        <ul aria-label={t('photos.soFar')} className="flex flex-wrap gap-3">
          {shown.map((p, i) => (
            <li key={p.id} className="flex w-36 flex-col gap-1.5">
              {p.mimeType.startsWith('image/') ? (
                <img
                  src={p.url}
                  alt={t('photos.alt', { n: i + 1, name: p.fileName })}
                  className="aspect-[4/3] w-36 rounded-control border border-rule-strong bg-sunk object-cover"
                />
              ) : (
                <span className="flex aspect-[4/3] w-36 items-center justify-center break-all rounded-control border border-rule-strong bg-sunk p-2 text-center font-mono text-sm">
                  {p.fileName}
                </span>
              )}
              <Button size="sm" onClick={() => remove(p.id)} aria-label={t('photos.removeLabel', { name: p.fileName })}>
                <Icon name="trash" size={16} />
                {t('photos.remove')}
              </Button>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
