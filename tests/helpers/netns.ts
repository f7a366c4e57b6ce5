/**
 * A network namespace joined to this machine by a veth pair, to run a worker "on another host"
 * whose network can be cut (`down`) and restored (`up`). Needs root and a kernel that allows
 * namespaces; `probeNetns` says whether that is so here, and why not.
 */
import { spawnSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';

export interface TestNetwork {
	namespace: string;
	/** this machine's end of the link */
	hostIp: string;
	/** the namespace's end */
	nsIp: string;
	/** `10.x.y.z/30`, for pg_hba.conf */
	subnet: string;
	/** prefix that runs a command inside the namespace */
	prefix: string[];
	/** the link goes down: packets are lost, connections hang without any reset */
	down(): void;
	up(): void;
	destroy(): void;
}

function run(args: string[]): { ok: boolean; out: string } {
	const r = spawnSync(args[0], args.slice(1), { encoding: 'utf8' });
	return { ok: r.status === 0, out: `${r.stdout ?? ''}${r.stderr ?? ''}${r.error ? r.error.message : ''}`.trim() };
}

function must(args: string[]): void {
	const r = run(args);
	if (!r.ok) throw new Error(`${args.join(' ')} failed: ${r.out}`);
}

/** null when namespaces work here, else the reason they do not. */
export function probeNetns(): string | null {
	if (typeof process.getuid !== 'function' || process.getuid() !== 0) return 'network namespaces need root (the tests run as another user)';
	if (!run(['ip', '-V']).ok) return 'the `ip` command (iproute2) is not installed';
	const tag = randomBytes(3).toString('hex');
	const ns = `tfprobe${tag}`;
	const add = run(['ip', 'netns', 'add', ns]);
	if (!add.ok) return `\`ip netns add\` is not allowed here: ${add.out}`;
	try {
		const veth = run(['ip', 'link', 'add', `tfp${tag}`, 'type', 'veth', 'peer', 'name', `tfq${tag}`]);
		if (!veth.ok) return `a veth pair cannot be created here: ${veth.out}`;
		run(['ip', 'link', 'del', `tfp${tag}`]);
		const exec = run(['ip', 'netns', 'exec', ns, 'ip', 'link', 'set', 'lo', 'up']);
		if (!exec.ok) return `\`ip netns exec\` does not work here: ${exec.out}`;
		return null;
	} finally {
		run(['ip', 'netns', 'del', ns]);
	}
}

export function createTestNetwork(): TestNetwork {
	const tag = randomBytes(3).toString('hex');
	const octet = 16 + (randomBytes(1)[0] % 200);
	const namespace = `tfnet${tag}`;
	const hostDev = `tfh${tag}`;
	const nsDev = `tfn${tag}`;
	const hostIp = `10.231.${octet}.1`;
	const nsIp = `10.231.${octet}.2`;
	must(['ip', 'netns', 'add', namespace]);
	try {
		must(['ip', 'link', 'add', hostDev, 'type', 'veth', 'peer', 'name', nsDev]);
		must(['ip', 'link', 'set', nsDev, 'netns', namespace]);
		must(['ip', 'addr', 'add', `${hostIp}/30`, 'dev', hostDev]);
		must(['ip', 'link', 'set', hostDev, 'up']);
		must(['ip', 'netns', 'exec', namespace, 'ip', 'addr', 'add', `${nsIp}/30`, 'dev', nsDev]);
		must(['ip', 'netns', 'exec', namespace, 'ip', 'link', 'set', nsDev, 'up']);
		must(['ip', 'netns', 'exec', namespace, 'ip', 'link', 'set', 'lo', 'up']);
	} catch (e) {
		run(['ip', 'link', 'del', hostDev]);
		run(['ip', 'netns', 'del', namespace]);
		throw e;
	}
	let gone = false;
	return {
		namespace,
		hostIp,
		nsIp,
		subnet: `10.231.${octet}.0/30`,
		prefix: ['ip', 'netns', 'exec', namespace],
		down: () => must(['ip', 'link', 'set', hostDev, 'down']),
		up: () => must(['ip', 'link', 'set', hostDev, 'up']),
		destroy() {
			if (gone) return;
			gone = true;
			run(['ip', 'link', 'del', hostDev]);
			run(['ip', 'netns', 'del', namespace]);
		}
	};
}
