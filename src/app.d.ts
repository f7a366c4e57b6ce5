// See https://svelte.dev/docs/kit/types#app.d.ts
import type { Member, SignedInUser } from '$lib/server/guard';

declare global {
	namespace App {
		interface Locals {
			/** filled lazily by `currentUser` in `$lib/server/guard`; undefined = not looked up yet */
			user: SignedInUser | null | undefined;
			/** filled lazily by `currentMember` / `requireMember` */
			member: Member | null | undefined;
		}
		// interface Error {}
		// interface PageData {}
		// interface PageState {}
		// interface Platform {}
	}
}

export {};
