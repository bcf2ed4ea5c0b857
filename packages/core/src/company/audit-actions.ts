/**
 * Plain names for the actions in the audit trail. The server records codes
 * ("user.role_changed"); the office reads these names, in the table and in the
 * CSV export. Codes recorded by later features without a name here are shown as
 * the code itself, so nothing is hidden.
 */

export const auditActionGroups = ['Sign-in and account', 'People', 'Company', 'Orders and payments', 'Reports'] as const;
export type AuditActionGroup = (typeof auditActionGroups)[number];

export const auditActions = {
  'auth.sign_in': { label: 'Signed in', group: 'Sign-in and account' },
  'auth.sign_out': { label: 'Signed out', group: 'Sign-in and account' },
  'auth.password_reset_requested': { label: 'Asked for a password reset link', group: 'Sign-in and account' },
  'auth.password_reset': { label: 'Reset their password', group: 'Sign-in and account' },
  'auth.invitation_accepted': { label: 'Accepted an invitation', group: 'Sign-in and account' },
  'account.name_changed': { label: 'Changed their name', group: 'Sign-in and account' },
  'account.email_change_requested': { label: 'Asked to change their e-mail address', group: 'Sign-in and account' },
  'account.email_changed': { label: 'Confirmed a new e-mail address', group: 'Sign-in and account' },
  'account.password_changed': { label: 'Changed their password', group: 'Sign-in and account' },
  'account.other_sessions_ended': { label: 'Signed out of other devices', group: 'Sign-in and account' },

  'user.invited': { label: 'Invited a person', group: 'People' },
  'user.invitation_resent': { label: 'Re-sent an invitation', group: 'People' },
  'user.role_changed': { label: 'Changed a role', group: 'People' },
  'user.disabled': { label: 'Disabled an account', group: 'People' },
  'user.enabled': { label: 'Re-enabled an account', group: 'People' },
  'user.signed_up': { label: 'Agent asked to sign up', group: 'People' },
  'user.sign_up_completed': { label: 'Agent confirmed their sign-up', group: 'People' },

  'company.profile_updated': { label: 'Updated the company profile', group: 'Company' },
  'company.settings_updated': { label: 'Changed company settings', group: 'Company' },
  'company.logo_changed': { label: 'Uploaded a new logo', group: 'Company' },
  'company.logo_removed': { label: 'Removed the logo', group: 'Company' },
  'fee_item.created': { label: 'Added a fee', group: 'Company' },
  'fee_item.updated': { label: 'Changed a fee', group: 'Company' },
  'fee_list.reordered': { label: 'Reordered the fee list', group: 'Company' },
  'price_book.updated': { label: 'Changed the price book', group: 'Company' },
  'audit.exported': { label: 'Exported the audit trail', group: 'Company' },

  'order.created': { label: 'Placed an order', group: 'Orders and payments' },
  'order.scheduled': { label: 'Scheduled an order', group: 'Orders and payments' },
  'order.rescheduled': { label: 'Rescheduled an order', group: 'Orders and payments' },
  'order.cancelled': { label: 'Cancelled an order', group: 'Orders and payments' },
  'payment.received': { label: 'Payment received', group: 'Orders and payments' },
  'payment.refunded': { label: 'Refunded a payment', group: 'Orders and payments' },

  // Recorded by the review, portal and sharing features as they arrive.
  'report.published': { label: 'Published a report', group: 'Reports' },
  'report.amended': { label: 'Amended a published report', group: 'Reports' },
  'report.overridden': { label: 'Overrode a computed result', group: 'Reports' },
  'report.disclosed': { label: 'Disclosed a report to the other side', group: 'Reports' },
  'report.downloaded': { label: 'Downloaded a report PDF', group: 'Reports' },
  'share_link.created': { label: 'Made a share link', group: 'Reports' },
  'share_link.revoked': { label: 'Revoked a share link', group: 'Reports' },
} as const satisfies Record<string, { label: string; group: AuditActionGroup }>;

export type KnownAuditAction = keyof typeof auditActions;

export function auditActionLabel(code: string): string {
  return code in auditActions ? auditActions[code as KnownAuditAction].label : code;
}
