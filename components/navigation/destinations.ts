import type { SiteRole } from '../../shared/api/schemas';

export interface Destination {
  href: '/notebooks' | '/groups' | '/activity' | '/account' | '/mail';
  label: string;
  glyph: string;
  adminOnly?: boolean;
  /** Shows the number of unread activity items. */
  unreadBadge?: boolean;
}

export const destinations: Destination[] = [
  { href: '/notebooks', label: 'Notebooks', glyph: '∂' },
  { href: '/groups', label: 'Groups', glyph: '⊗' },
  { href: '/activity', label: 'Activity', glyph: '◔', unreadBadge: true },
  { href: '/mail', label: 'Mail', glyph: '✉', adminOnly: true },
  { href: '/account', label: 'Account', glyph: '◐' },
];

export function destinationsFor(role: SiteRole): Destination[] {
  return destinations.filter((d) => !d.adminOnly || role === 'admin');
}
