// The SMTP connection: the local mail catcher by default, any SMTP host with SMTP_URL set
// (README, "Real Stripe and a real mail server").
import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '$env/dynamic/private';

let transporter: Transporter | null = null;

export function mailTransport(): Transporter {
	transporter ??= nodemailer.createTransport(env.SMTP_URL ?? 'smtp://127.0.0.1:1025');
	return transporter;
}

/** The sender; MAIL_FROM overrides it, otherwise the studio's own name and address. */
export function mailFrom(studioName: string, studioEmail: string): string {
	if (env.MAIL_FROM) return env.MAIL_FROM;
	return `"${studioName.replaceAll('"', '')}" <${studioEmail}>`;
}

/** Where links in messages point: the exact origin people use. */
export function publicOrigin(): string {
	return (env.ORIGIN ?? env.BETTER_AUTH_URL ?? 'http://127.0.0.1:3000').replace(/\/$/, '');
}
