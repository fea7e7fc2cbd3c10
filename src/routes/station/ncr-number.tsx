import { Link } from 'react-router';
import { ncrHref } from '../../lib/paths';

/** An NCR's number, a way to its page for those who may read it. */
export function NcrNumber({ number, link }: { number: string; link: boolean }) {
  if (!link) return <span className="font-mono font-semibold">{number}</span>;
  return (
    <Link
      to={ncrHref(number)}
      className="inline-flex min-h-11 floor:min-h-12 items-center font-mono font-semibold text-accent underline underline-offset-4"
    >
      {number}
    </Link>
  );
}
