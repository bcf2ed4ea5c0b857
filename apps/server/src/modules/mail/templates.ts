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
  /** The company's logo as an absolute URL, when it has one (shown above its name). */
  logoUrl?: string | null | undefined;
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
${ctx.logoUrl ? `<p style="margin:0 0 8px"><img src="${escapeHtml(ctx.logoUrl)}" alt="" style="display:block;max-height:56px;max-width:240px;height:auto;width:auto;border:0"></p>\n` : ''}<p style="margin:0 0 24px;font-weight:700;color:#a5492c;letter-spacing:0.02em">${escapeHtml(ctx.companyName)}</p>
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

  agent_sign_up: (ctx: MailContext, v: { name: string; url: string; validHours: number }) =>
    layout(ctx, `Confirm your e-mail to join ${ctx.companyName} on Underfoot`, {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        `You asked to join ${ctx.companyName} on Underfoot as an agent, to order sewer line inspections and read their reports.`,
        `Confirm this e-mail address and choose a password with the link below. The link works for ${v.validHours} hours.`,
      ],
      action: { label: 'Confirm and choose a password', url: v.url },
      after: ['If you did not ask for this, ignore this e-mail; nothing happens without the link.'],
    }),

  sign_up_existing: (ctx: MailContext, v: { name: string; signInUrl: string; resetUrl: string }) =>
    layout(ctx, 'You already have an Underfoot account', {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        `Someone asked to sign up for ${ctx.companyName} on Underfoot with this e-mail address, which already has an account.`,
        'Sign in with your password. If you have forgotten it, you can reset it from the sign-in page.',
      ],
      action: { label: 'Sign in', url: v.signInUrl },
      after: [`Reset your password: ${v.resetUrl}`, 'If it was not you, you can ignore this e-mail; nothing has changed.'],
    }),

  email_change_confirm: (ctx: MailContext, v: { name: string; url: string; validHours: number }) =>
    layout(ctx, 'Confirm your new e-mail address for Underfoot', {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        'You asked to sign in to Underfoot with this e-mail address from now on.',
        `Confirm it with the link below. Until you do, your old address stays in use. The link works for ${v.validHours} hours.`,
      ],
      action: { label: 'Confirm my new address', url: v.url },
      after: ['If you did not ask for this, ignore this e-mail.'],
    }),

  email_change_taken: (ctx: MailContext, v: { signInUrl: string; resetUrl: string }) =>
    layout(ctx, 'Someone tried to move an Underfoot account to this address', {
      greeting: 'Hello,',
      paragraphs: [
        'Someone signed in to Underfoot asked to use this e-mail address for their account. This address already has an account of its own, so nothing has changed and nothing will.',
        'If you have forgotten your password, you can reset it from the sign-in page.',
      ],
      action: { label: 'Sign in', url: v.signInUrl },
      after: [`Reset your password: ${v.resetUrl}`, 'If you do not know why you got this, you can ignore it.'],
    }),

  email_change_requested: (ctx: MailContext, v: { name: string; newEmail: string }) =>
    layout(ctx, 'Your Underfoot sign-in address is about to change', {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        `Someone signed in to your account asked to change its e-mail address to ${v.newEmail}. We sent a confirmation link there; nothing changes until it is followed.`,
        `If this was not you, change your password now and tell ${ctx.companyName}.`,
      ],
    }),

  email_changed: (ctx: MailContext, v: { name: string; newEmail: string }) =>
    layout(ctx, 'Your Underfoot sign-in address has changed', {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        `Your account now signs in with ${v.newEmail}. Mail from Underfoot will go there from now on.`,
        `If this was not you, contact ${ctx.companyName} straight away.`,
      ],
    }),

  password_changed: (ctx: MailContext, v: { name: string; otherSessionsEnded: number }) =>
    layout(ctx, 'Your Underfoot password has changed', {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        `The password for your account was just changed${v.otherSessionsEnded > 0 ? ', and your other signed-in devices were signed out' : ''}.`,
        `If this was not you, reset your password from the sign-in page and tell ${ctx.companyName}.`,
      ],
    }),

  report_released: (ctx: MailContext, v: { name: string; url: string; address: string; revised: boolean }) =>
    layout(ctx, `${v.revised ? 'Updated report' : 'Your sewer line report is ready'}: ${v.address}`, {
      greeting: `Hello ${v.name},`,
      paragraphs: [
        v.revised
          ? `${ctx.companyName} has published an updated sewer line report for ${v.address}. The report page shows what changed.`
          : `${ctx.companyName} has finished the sewer line inspection for ${v.address}. The report shows the condition grade, where any problems are, what to do about them and a rough cost range.`,
        'You can read it on your phone, ask the inspector a question and download a PDF.',
      ],
      action: { label: 'Read the report', url: v.url },
    }),

  report_question: (ctx: MailContext, v: { name: string; url: string; address: string; askerName: string; question: string }) =>
    layout(ctx, `Question about the report for ${v.address}`, {
      greeting: `Hello ${v.name},`,
      paragraphs: [`${v.askerName} asked a question about the sewer line report for ${v.address}:`, `“${v.question}”`],
      action: { label: 'Answer in Underfoot', url: v.url },
    }),

  report_answer: (
    ctx: MailContext,
    v: { name: string; url: string; address: string; answererName: string; question: string; answer: string },
  ) =>
    layout(ctx, `Answer about the report for ${v.address}`, {
      greeting: `Hello ${v.name},`,
      paragraphs: [`Question: “${v.question}”`, `${v.answererName} answered: “${v.answer}”`],
      action: { label: 'See it on the report', url: v.url },
    }),
} satisfies Record<string, (ctx: MailContext, vars: never) => RenderedMail>;

export type MailTemplateName = keyof typeof mailTemplates;
export type MailVars<T extends MailTemplateName> = Parameters<(typeof mailTemplates)[T]>[1];
