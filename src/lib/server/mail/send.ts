/**
 * Outgoing e-mail over SMTP (nodemailer). Reads `process.env` (no `$env`), so the worker can send
 * run-finished mail too. Locally and in tests SMTP_HOST/SMTP_PORT point at the fake catcher.
 */
import nodemailer, { type Transporter } from 'nodemailer';
import { DEFAULT_SMTP_PORT } from './catcher.js';

export const MAIL_FROM = process.env.MAIL_FROM ?? 'Twofold <no-reply@twofold.local>';

let cached: { key: string; transport: Transporter } | null = null;

/** SMTP settings from the environment; the default is the local catcher. */
export function smtpSettings() {
	return {
		host: process.env.SMTP_HOST ?? '127.0.0.1',
		port: Number(process.env.SMTP_PORT ?? DEFAULT_SMTP_PORT),
		secure: process.env.SMTP_SECURE === '1',
		user: process.env.SMTP_USER,
		pass: process.env.SMTP_PASS
	};
}

export function transport(): Transporter {
	const s = smtpSettings();
	const key = JSON.stringify(s);
	if (cached?.key === key) return cached.transport;
	const t = nodemailer.createTransport({
		host: s.host,
		port: s.port,
		secure: s.secure,
		// the local catcher offers no TLS
		ignoreTLS: !s.secure && (s.host === '127.0.0.1' || s.host === 'localhost'),
		auth: s.user ? { user: s.user, pass: s.pass ?? '' } : undefined
	});
	cached = { key, transport: t };
	return t;
}

export interface MailMessage {
	to: string;
	subject: string;
	text: string;
	html?: string;
}

export async function sendMail(message: MailMessage): Promise<void> {
	await transport().sendMail({ from: MAIL_FROM, ...message });
}
