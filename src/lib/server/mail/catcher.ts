/**
 * The local fake SMTP server: accepts every message on loopback and stores it in `outgoing_mail`,
 * so local installs and tests can read what Twofold would have sent. Never for production mail.
 *
 * Standalone: `npx tsx src/lib/server/mail/catcher.ts` (reads DATABASE_URL, SMTP_PORT, default 54325).
 * No `$env` imports: it runs outside SvelteKit.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { SMTPServer } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import { createDb, type DbHandle } from '../db/index.js';
import { outgoingMail } from '../db/schema.js';

export const DEFAULT_SMTP_PORT = 54325;

export interface MailCatcher {
	port: number;
	close(): Promise<void>;
}

function addresses(value: AddressObject | AddressObject[] | undefined): string[] {
	if (!value) return [];
	const list = Array.isArray(value) ? value : [value];
	return list.flatMap((a) => a.value.map((v) => v.address ?? '')).filter(Boolean);
}

/** Starts the catcher; `port: 0` picks a free port (read it back from the result). */
export async function startMailCatcher(
	options: { port?: number; host?: string; databaseUrl?: string; db?: DbHandle } = {}
): Promise<MailCatcher> {
	const handle = options.db ?? createDb({ url: options.databaseUrl, max: 2, applicationName: 'twofold-mail-catcher' });
	const ownsDb = !options.db;
	const server = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS'],
		logger: false,
		size: 10 * 1024 * 1024,
		onData(stream, session, callback) {
			const chunks: Buffer[] = [];
			stream.on('data', (c: Buffer) => chunks.push(c));
			stream.on('error', callback);
			stream.on('end', async () => {
				try {
					const raw = Buffer.concat(chunks);
					const parsed = await simpleParser(raw);
					const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
					const to = addresses(parsed.to);
					const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : '';
					await handle.db.insert(outgoingMail).values({
						messageId: parsed.messageId ?? null,
						fromAddress: addresses(parsed.from)[0] ?? envelopeFrom,
						toAddresses: (to.length ? to : envelopeTo).join(', '),
						subject: parsed.subject ?? '',
						text: parsed.text ?? null,
						html: typeof parsed.html === 'string' ? parsed.html : null,
						raw: raw.toString('utf8')
					});
					callback();
				} catch (e) {
					callback(e as Error);
				}
			});
		}
	});
	const host = options.host ?? '127.0.0.1';
	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(options.port ?? DEFAULT_SMTP_PORT, host, () => resolve());
	});
	server.on('error', (e) => console.error('[mail-catcher]', e.message));
	const address = server.server.address();
	const port = typeof address === 'object' && address ? address.port : (options.port ?? DEFAULT_SMTP_PORT);
	return {
		port,
		close: async () => {
			await new Promise<void>((resolve) => server.close(() => resolve()));
			if (ownsDb) await handle.close();
		}
	};
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
	const port = Number(process.env.SMTP_PORT ?? DEFAULT_SMTP_PORT);
	startMailCatcher({ port, host: process.env.SMTP_HOST ?? '127.0.0.1' }).then(
		(catcher) => {
			console.error(`[mail-catcher] listening on 127.0.0.1:${catcher.port}, storing into outgoing_mail`);
			const stop = () => catcher.close().then(() => process.exit(0));
			process.on('SIGTERM', stop);
			process.on('SIGINT', stop);
		},
		(e) => {
			console.error(`[mail-catcher] could not start: ${e.message}`);
			process.exit(1);
		}
	);
}
