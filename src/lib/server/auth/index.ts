/**
 * Auth.js set-up: e-mail + password (Credentials, argon2) and an e-mail sign-in link (Nodemailer
 * provider through our SMTP settings). Sessions are JWTs in a cookie: Credentials requires it.
 */
import { SvelteKitAuth, CredentialsSignin } from '@auth/sveltekit';
import Credentials from '@auth/sveltekit/providers/credentials';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import { DrizzleAdapter } from '@auth/drizzle-adapter';
import { sql } from 'drizzle-orm';
import { db } from '../db/app.js';
import { accounts, sessions, users, verificationTokens } from '../db/schema.js';
import { sendMail, smtpSettings, MAIL_FROM } from '../mail/send.js';
import { hashPassword, verifyPassword } from './passwords.js';
import { clearFailures, lockedForMs, recordFailure } from './throttle.js';

/** Wrong e-mail or password: one message for both, so the form never tells which part was wrong. */
class WrongCredentials extends CredentialsSignin {
	code = 'credentials';
}

class Throttled extends CredentialsSignin {
	code = 'throttled';
}

export async function findUserByEmail(email: string) {
	const [row] = await db
		.select()
		.from(users)
		.where(sql`lower(${users.email}) = ${email.trim().toLowerCase()}`);
	return row ?? null;
}

async function authorizePassword(credentials: Partial<Record<string, unknown>>) {
	const email = typeof credentials.email === 'string' ? credentials.email.trim() : '';
	const password = typeof credentials.password === 'string' ? credentials.password : '';
	if (!email || !password) throw new WrongCredentials();
	if ((await lockedForMs(db, email)) > 0) throw new Throttled();
	const user = await findUserByEmail(email);
	// verify even without a user, so timing does not reveal which addresses exist
	dummyHash ??= hashPassword(crypto.randomUUID());
	const ok = await verifyPassword(user?.passwordHash ?? (await dummyHash), password);
	if (!user || !ok) {
		await recordFailure(db, email);
		throw new WrongCredentials();
	}
	await clearFailures(db, email);
	return { id: user.id, email: user.email, name: user.name };
}

// a hash of a random string, for the same-cost path when the address is unknown
let dummyHash: Promise<string> | null = null;

export const { handle: authHandle, signIn, signOut } = SvelteKitAuth({
	adapter: DrizzleAdapter(db, {
		usersTable: users,
		accountsTable: accounts,
		sessionsTable: sessions,
		verificationTokensTable: verificationTokens
	}),
	session: { strategy: 'jwt', maxAge: 14 * 24 * 3600 },
	trustHost: true,
	logger: {
		// a wrong password is an expected outcome, not a server error worth a stack trace
		error(error) {
			if (error instanceof CredentialsSignin) return;
			console.error('[auth]', error);
		},
		warn() {}
	},
	secret: process.env.AUTH_SECRET,
	pages: { signIn: '/signin', error: '/signin', verifyRequest: '/signin/check-mail' },
	providers: [
		Credentials({
			id: 'credentials',
			credentials: { email: { label: 'E-mail' }, password: { label: 'Password', type: 'password' } },
			authorize: authorizePassword
		}),
		Nodemailer({
			id: 'email',
			server: { host: smtpSettings().host, port: smtpSettings().port },
			from: MAIL_FROM,
			maxAge: 30 * 60,
			async sendVerificationRequest({ identifier, url }) {
				await sendMail({
					to: identifier,
					subject: 'Your Twofold sign-in link',
					text: `Open this link to sign in to Twofold (valid for 30 minutes):\n\n${url}\n\nIf you did not ask for it, ignore this message.`
				});
			}
		})
	],
	callbacks: {
		async signIn({ user, account }) {
			// e-mail links only for people who already have an account (invitations create accounts);
			// unknown addresses see the same "check your mail" page, so existence is not revealed
			if (account?.provider === 'email') {
				const existing = user.email ? await findUserByEmail(user.email) : null;
				if (!existing) return '/signin/check-mail';
			}
			return true;
		},
		async jwt({ token, user }) {
			if (user?.id) token.sub = user.id;
			return token;
		},
		async session({ session, token }) {
			if (token.sub && session.user) session.user.id = token.sub;
			return session;
		}
	}
});

