/**
 * Every e-mail Underfoot sends, in plain text and HTML, carrying the company's name.
 * One layout so mail looks the same as the app (paper, slate ink, terracotta).
 */

export interface RenderedMail {
  subject: string;
  text: string;
  html: string;
}

interface MailContext {
  companyName: string;
}

const escapeHtml = (value: string) =>
  value.replace(/[&<>"']/g, (ch) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[ch]!);

interface Block {
  greeting: string;
  paragraphs: string[];
  action?: { label: string; url: string };
  after?: string[];
}

function layout(ctx: MailContext, subject: string, block: Block): RenderedMail {
  const textParts = [block.greeting, '', ...block.paragraphs.flatMap((p) => [p, ''])];
  if (block.action) textParts.push(`${block.action.label}: ${block.action.url}`, '');
  for (const p of block.after ?? []) textParts.push(p, '');
  textParts.push(`— ${ctx.companyName}, through Underfoot`);

  const para = (p: string) => `<p style="margin:0 0 16px;line-height:1.5">${escapeHtml(p)}</p>`;
  const button = block.action
    ? `<p style="margin:24px 0"><a href="${escapeHtml(block.action.url)}" style="background:#a5492c;color:#ffffff;padding:12px 20px;border-radius:6px;text-decoration:none;font-weight:600;display:inline-block">${escapeHtml(block.action.label)}</a></p>
<p style="margin:0 0 16px;font-size:13px;color:#4a5560">If the button does not work, copy this address into your browser:<br><a href="${escapeHtml(block.action.url)}" style="color:#1d5a7a;word-break:break-all">${escapeHtml(block.action.url)}</a></p>`
    : '';
  const html = `<!doctype html><html><head><meta charset="utf-8"><title>${escapeHtml(subject)}</title></head>
<body style="margin:0;background:#f7f3ec;color:#1f2a33;font-family:Inter,Arial,sans-serif;font-size:16px">
<div style="max-width:560px;margin:0 auto;padding:32px 20px">
<p style="margin:0 0 24px;font-weight:700;color:#a5492c;letter-spacing:0.02em">${escapeHtml(ctx.companyName)}</p>
${para(block.greeting)}
${block.paragraphs.map(para).join('\n')}
${button}
${(block.after ?? []).map(para).join('\n')}
<p style="margin:32px 0 0;font-size:13px;color:#4a5560">Sent by ${escapeHtml(ctx.companyName)} through Underfoot.</p>
</div></body></html>`;
  return { subject, text: textParts.join('\n'), html };
}

export const mailTemplates = {
  password_reset: (ctx: MailContext, v: { name: string; url: string; validMinutes: number }) =>
    layout(ctx, 'Reset your Underfoot password', {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        'Someone asked to reset the password for your account. If it was you, choose a new password with the link below.',
        `The link works once, for ${v.validMinutes} minutes.`,
      ],
      action: { label: 'Choose a new password', url: v.url },
      after: ['If you did not ask for this, you can ignore this e-mail; your password stays the same.'],
    }),

  invitation: (ctx: MailContext, v: { name: string; url: string; inviterName: string; roleLabel: string; validDays: number }) =>
    layout(ctx, `${v.inviterName} invited you to ${ctx.companyName} on Underfoot`, {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        `${v.inviterName} has invited you to join ${ctx.companyName} on Underfoot as ${v.roleLabel}.`,
        `Choose a password to finish setting up your account. The link works for ${v.validDays} days.`,
      ],
      action: { label: 'Set up my account', url: v.url },
    }),

  order_invitation: (
    ctx: MailContext,
    v: { name: string; url: string; inviterName: string; address: string; partyLabel: string; kindLabel: string; validDays: number },
  ) =>
    layout(ctx, `Sewer line inspection ordered for ${v.address}`, {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        `${v.inviterName} has ordered a ${v.kindLabel.toLowerCase()} sewer line inspection from ${ctx.companyName} for ${v.address}, and added you as ${v.partyLabel.toLowerCase()}.`,
        'A camera goes through the pipe that carries waste water from the house to the public sewer. You will get a short report you can read on your phone, with a condition grade, photos of anything found and a repair cost range.',
        `Set up your account to follow the order and read the report when it is ready. The link works for ${v.validDays} days.`,
      ],
      action: { label: 'Set up my account', url: v.url },
    }),

  order_confirmation: (
    ctx: MailContext,
    v: { name: string; url: string; address: string; kindLabel: string; deadline: string; feeText: string; payerText: string },
  ) =>
    layout(ctx, `Order received: ${v.address}`, {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        `${ctx.companyName} has received a ${v.kindLabel.toLowerCase()} sewer line inspection order for ${v.address}.`,
        `Contingency deadline: ${v.deadline}. The office will schedule the visit and e-mail everyone the arrival window.`,
        `Inspection fee: ${v.feeText}. ${v.payerText}`,
      ],
      action: { label: 'View the order', url: v.url },
    }),

  schedule_change: (
    ctx: MailContext,
    v: { name: string; url: string; address: string; windowText: string; inspectorName: string; rescheduled: boolean; note: string },
  ) =>
    layout(ctx, `${v.rescheduled ? 'New time' : 'Scheduled'}: sewer inspection at ${v.address}`, {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        `${v.rescheduled ? 'The sewer line inspection has moved.' : 'The sewer line inspection is scheduled.'} ${v.inspectorName} will arrive ${v.windowText}.`,
        'The inspector needs to reach a cleanout or another way into the sewer line, and water should not be running in the house during the camera work.',
        ...(v.note ? [`Note from the office: ${v.note}`] : []),
      ],
      action: { label: 'View the order', url: v.url },
    }),

  order_cancelled: (ctx: MailContext, v: { name: string; url: string; address: string; reason: string; refundText: string }) =>
    layout(ctx, `Cancelled: sewer inspection at ${v.address}`, {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        `The sewer line inspection for ${v.address} has been cancelled.`,
        `Reason: ${v.reason}`,
        ...(v.refundText ? [v.refundText] : []),
      ],
      action: { label: 'View the order', url: v.url },
    }),

  payment_receipt: (
    ctx: MailContext,
    v: { name: string; url: string; address: string; amountText: string; paidAt: string; lines: string[]; reference: string },
  ) =>
    layout(ctx, `Receipt: ${v.amountText} for the sewer inspection at ${v.address}`, {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        `Thank you. ${ctx.companyName} received ${v.amountText} on ${v.paidAt}.`,
        ...v.lines,
        `Payment reference: ${v.reference}`,
      ],
      action: { label: 'View the order', url: v.url },
      after: ['Keep this e-mail as your receipt.'],
    }),

  payment_refunded: (ctx: MailContext, v: { name: string; url: string; address: string; amountText: string }) =>
    layout(ctx, `Refund: ${v.amountText} for the sewer inspection at ${v.address}`, {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        `${ctx.companyName} has refunded ${v.amountText} to the card you paid with. Banks usually show it within 5 to 10 business days.`,
      ],
      action: { label: 'View the order', url: v.url },
    }),
} satisfies Record<string, (ctx: MailContext, vars: never) => RenderedMail>;

export type MailTemplateName = keyof typeof mailTemplates;
export type MailVars<T extends MailTemplateName> = Parameters<(typeof mailTemplates)[T]>[1];
