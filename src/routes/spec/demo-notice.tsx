import { Notice } from '../../components/ui/notice';

/** The demo book's numbers are made up; nobody should machine a part to them. */
export function DemoValuesNotice() {
  return (
    <Notice tone="info" title="Illustrative demo values">
      The limits in this book are invented for the demo plant and are not any manufacturer&apos;s figures. A plant loads
      its own engineering specifications before parts are judged against them.
    </Notice>
  );
}
