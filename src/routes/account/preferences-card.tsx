import { useId, useState } from 'react';
import type { MeResponse } from '../../../shared/schemas/auth';
import { useSetPreferences } from '../../api/auth/preferences';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Label } from '../../components/ui/field';
import { Select } from '../../components/ui/select';
import { useT } from '../../lib/i18n';

type User = MeResponse['user'];

/** The language the floor screens speak to this person, and the unit system their readings start in. */
export function PreferencesCard({ user }: { user: User }) {
  const t = useT();
  const languageId = useId();
  const unitsId = useId();
  const [language, setLanguage] = useState(user.language);
  const [unitSystem, setUnitSystem] = useState(user.unitSystem);
  const save = useSetPreferences();
  return (
    <Card labelledBy="preferences-heading">
      <CardHeader id="preferences-heading" title={t('account.language')} />
      <CardBody>
        <form
          className="flex flex-wrap items-end gap-4"
          onSubmit={(e) => {
            e.preventDefault();
            save.mutate({ language, unitSystem });
          }}
        >
          <div>
            <Label htmlFor={languageId}>{t('account.languageLabel')}</Label>
            <Select
              id={languageId}
              value={language}
              onChange={(e) => setLanguage(e.target.value === 'es' ? 'es' : 'en')}
              options={[
                { value: 'en', label: 'English' },
                { value: 'es', label: 'Español' },
              ]}
            />
          </div>
          <div>
            <Label htmlFor={unitsId}>{t('account.unitsLabel')}</Label>
            <Select
              id={unitsId}
              value={unitSystem}
              onChange={(e) => setUnitSystem(e.target.value === 'metric' ? 'metric' : 'inch')}
              options={[
                { value: 'inch', label: t('account.inch') },
                { value: 'metric', label: t('account.metric') },
              ]}
            />
          </div>
          <Button type="submit" variant="primary" disabled={save.isPending}>
            {t('account.save')}
          </Button>
          <p role="status" className="text-base text-ink-soft empty:hidden">
            {save.isSuccess ? t('account.saved') : save.error ? save.error.message : ''}
          </p>
        </form>
      </CardBody>
    </Card>
  );
}
