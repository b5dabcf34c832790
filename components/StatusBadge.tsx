import { Tag } from './Tag';

/** Draft (ochre) or approved (green): draft assumptions are marked wherever they appear. */
export function StatusBadge({ status }: { status: 'draft' | 'approved' }) {
  return status === 'draft' ? <Tag label="Draft" tone="warning" /> : <Tag label="Approved" tone="success" />;
}
