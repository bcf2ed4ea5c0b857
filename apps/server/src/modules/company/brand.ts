/** Where a company's logo is served (company.router.ts companyLogoRouter): unguessable by its id, because it appears in e-mails and the public portal. */
export const logoPath = (logoId: string) => `/api/company-logos/${logoId}.png`;

export interface MailBrand {
  companyName: string;
  /** An absolute address: mail is read away from the app. */
  logoUrl: string | null;
}

/** A company (its row in `companies`) as every e-mail it sends shows it: the name, under its logo when it has one. */
export function mailBrandOf(company: { name: string; logo_id: string | null }, publicUrl: string): MailBrand {
  return { companyName: company.name, logoUrl: company.logo_id ? `${publicUrl}${logoPath(company.logo_id)}` : null };
}
