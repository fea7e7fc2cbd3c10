import { useNavigate } from 'react-router';
import { gaugeBody } from '../../../shared/schemas/gauges';
import { useRegisterGauge } from '../../api/gauges/gauges';
import { Form, SubmitButton } from '../../components/form';
import { NumberField, TextField } from '../../components/form-fields';
import { Button } from '../../components/ui/button';
import { Dialog, DialogActions } from '../../components/ui/dialog';
import { gaugeHref } from '../../lib/paths';

/** Registers a gauge in the register, then opens its page, where its first calibration is recorded. */
export function AddGaugeDialog({ onClose }: { onClose: () => void }) {
  const register = useRegisterGauge();
  const navigate = useNavigate();
  return (
    <Dialog open onClose={onClose} width="wide" title="Add a gauge">
      <Form
        schema={gaugeBody}
        defaultValues={{ code: '', description: '', kind: '', serial: '', unit: '', location: '', owner: '' }}
        onSubmit={async (body) => {
          const g = await register.mutateAsync(body);
          onClose();
          await navigate(gaugeHref(g.code));
        }}
      >
        <p>A new gauge cannot be used at a station until its first calibration is recorded.</p>
        <div className="grid grid-cols-1 gap-4 sm:grid-cols-[minmax(0,1fr)_minmax(0,2fr)]">
          <TextField name="code" label="Code" mono autoFocus hint="Letters, digits and dashes, as on its tag." />
          <TextField name="description" label="Description" />
        </div>
        <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
          <TextField name="kind" label="Kind of gauge" hint="As characteristics name it, e.g. bore gauge." />
          <TextField name="serial" label="Maker’s serial" optional />
        </div>
        <div className="grid grid-cols-2 gap-4 sm:grid-cols-4">
          <TextField name="unit" label="Unit it reads in" mono />
          <NumberField name="resolution" label="Resolution" />
          <NumberField name="rangeLow" label="Range from" />
          <NumberField name="rangeHigh" label="Range to" />
        </div>
        <div className="grid grid-cols-1 gap-4 sm:grid-cols-3">
          <NumberField name="intervalDays" label="Calibration interval" unit="days" integer />
          <TextField name="location" label="Kept at" optional />
          <TextField name="owner" label="Owner" optional />
        </div>
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Add gauge</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}
