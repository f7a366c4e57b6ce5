/**
 * Password hashes: argon2id (@node-rs/argon2) with its defaults (19 MiB, 2 passes), the
 * OWASP-recommended minimum for argon2id (common practice).
 */
import { hash, verify } from '@node-rs/argon2';

export const MIN_PASSWORD_LENGTH = 10;

export function hashPassword(password: string): Promise<string> {
	return hash(password);
}

export async function verifyPassword(passwordHash: string | null, password: string): Promise<boolean> {
	if (!passwordHash) return false;
	try {
		return await verify(passwordHash, password);
	} catch {
		return false;
	}
}

/** A problem with a new password, or null when it is acceptable. */
export function passwordProblem(password: string): string | null {
	if (password.length < MIN_PASSWORD_LENGTH) return `Use at least ${MIN_PASSWORD_LENGTH} characters.`;
	if (password.length > 200) return 'Use at most 200 characters.';
	return null;
}
