// Links into the app that mail carries, built from PUBLIC_URL (the address people open Fieldfold at).
export interface AppLinks {
  home(): string;
  block(id: string): string;
  blockBids(id: string): string;
  myBids(): string;
  contract(id: string): string;
  contractLog(id: string): string;
  invoice(id: string): string;
  /** The screen that sets a new password with a mailed reset token. */
  resetPassword(token: string): string;
  /** Any path of the app ('/account'). */
  path(p: string): string;
}

export function appLinks(publicUrl: string): AppLinks {
  const base = publicUrl.replace(/\/+$/, '');
  const at = (p: string) => `${base}${p}`;
  return {
    home: () => at('/'),
    block: (id) => at(`/blocks/${encodeURIComponent(id)}`),
    blockBids: (id) => at(`/blocks/${encodeURIComponent(id)}`),
    myBids: () => at('/bids'),
    contract: (id) => at(`/contracts/${encodeURIComponent(id)}`),
    contractLog: (id) => at(`/contracts/${encodeURIComponent(id)}/log`),
    invoice: (id) => at(`/invoices/${encodeURIComponent(id)}`),
    resetPassword: (token) => at(`/reset-password?token=${encodeURIComponent(token)}`),
    path: (p) => at(p.startsWith('/') ? p : `/${p}`),
  };
}
