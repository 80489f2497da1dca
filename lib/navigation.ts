import type { SignupRole } from './roles';

// Which tab roots each role sees, in order. The app's (tabs) layout reads this; the server never trusts it.
export type TabName = 'index' | 'bids' | 'contracts' | 'invoices' | 'account';

export const TABS_BY_ROLE: Record<SignupRole, Array<{ name: TabName; label: string }>> = {
  grower: [
    { name: 'index', label: 'My blocks' },
    { name: 'contracts', label: 'Contracts' },
    { name: 'invoices', label: 'Invoices' },
    { name: 'account', label: 'Account' },
  ],
  grazier: [
    { name: 'index', label: 'Find grazing' },
    { name: 'bids', label: 'My bids' },
    { name: 'contracts', label: 'Contracts' },
    { name: 'invoices', label: 'Invoices' },
    { name: 'account', label: 'Account' },
  ],
};
