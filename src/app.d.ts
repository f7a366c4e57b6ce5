// See https://svelte.dev/docs/kit/types#app.d.ts
import type { Member, SignedInUser } from '$lib/server/guard';
import type { ApiTokenInfo } from '$lib/server/api/tokens';

declare global {
	namespace App {
		interface Locals {
			/** filled lazily by `currentUser` in `$lib/server/guard`; undefined = not looked up yet */
			user: SignedInUser | null | undefined;
			/** filled lazily by `currentMember` / `requireMember` */
			member: Member | null | undefined;
			/** the API token the request was authenticated with (set by `tokenHandle`), else undefined */
			apiToken?: ApiTokenInfo;
		}
		/** `message` for pages; `error` is the uniform error body of the JSON endpoints and the API */
		interface Error {
			message: string;
			error?: { code: string; message: string; issues: { path: string; message: string }[] };
		}
		// interface PageData {}
		// interface PageState {}
		// interface Platform {}
	}
}

export {};
