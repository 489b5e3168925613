import type { OutgoingMail } from '../../../mail/mailer';

/** The invitation of a co-investigator. */
export function invitationMail(input: { to: string; inviter: string; title: string; link: string; hasAccount: boolean }): OutgoingMail {
  return {
    to: input.to,
    subject: `${input.inviter} invites you to the proposal “${input.title}”`,
    text: [
      'Hello,',
      '',
      `${input.inviter} invites you to join the team of the proposal “${input.title}” on Spincycle as a co-investigator.`,
      input.hasAccount
        ? 'Open this link, signed in to your Spincycle account, to accept:'
        : 'You do not have a Spincycle account yet: this link lets you create one and then accept:',
      '',
      input.link,
      '',
      'The link works once. If you did not expect this invitation, ignore this message.',
    ].join('\n'),
  };
}
