/** Texts of the messages Rungwise sends. Each returns subject, plain text and HTML. */

type Mail = { subject: string; text: string; html: string };

const escape = (value: string) =>
  value.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

function compose(subject: string, paragraphs: string[], link?: { href: string; label: string }): Mail {
  const text = [...paragraphs, ...(link ? [`${link.label}: ${link.href}`] : [])].join('\n\n');
  const body = paragraphs.map((p) => `<p>${escape(p)}</p>`).join('');
  const button = link ? `<p><a href="${escape(link.href)}">${escape(link.label)}</a></p>` : '';
  return { subject, text, html: `<div style="font-family:sans-serif;line-height:1.5">${body}${button}</div>` };
}

export function invitationMail(inviterName: string, link: string, context?: string): Mail {
  return compose(
    'You are invited to Rungwise',
    [
      `${inviterName} has invited you to Rungwise${context ? `, ${context}` : ''}.`,
      'Open the link below to choose your name and password. The link works once and expires in 7 days.',
    ],
    { href: link, label: 'Accept the invitation' },
  );
}

export function passwordResetMail(name: string, link: string): Mail {
  return compose(
    'Reset your Rungwise password',
    [`Hello ${name},`, 'Someone asked to reset the password of your Rungwise account. If it was not you, ignore this message.'],
    { href: link, label: 'Choose a new password (valid for one hour)' },
  );
}

export function exerciseSeatMail(inviterName: string, exerciseTitle: string, seatLabel: string, link: string): Mail {
  return compose(
    `You are on the exercise “${exerciseTitle}”`,
    [`${inviterName} has added you to the Rungwise exercise “${exerciseTitle}” ${seatLabel}.`, 'Sign in and open the exercise from the link below.'],
    { href: link, label: 'Open the exercise' },
  );
}
