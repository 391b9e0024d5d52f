/**
 * The memory setting the command line runs with, shared by its launcher (bin/tessellab.mjs) and the
 * benchmark, which runs its cases as the command line would.
 *
 * Node takes large typed arrays from glibc's malloc, which maps each one afresh, and Linux faults in every
 * 4 KB page when it is first written. On the virtual machine the README's figures come from a fault costs
 * about 13 µs: writing a fresh 96 MB array took 0.30–0.36 s, and 0.01 s once its pages were in. The glibc
 * tunable glibc.malloc.hugetlb=1 (glibc 2.35 on) makes malloc advise transparent huge pages for the memory
 * it maps, 2 MB at a fault, where the kernel allows them (transparent_hugepage set to always or madvise).
 * Where it does not apply (another C library, another system, huge pages off) the setting is ignored.
 */

const TUNABLE = 'glibc.malloc.hugetlb';

const tunables = (env: NodeJS.ProcessEnv): string[] => (env.GLIBC_TUNABLES ?? '').split(':').filter((t) => t !== '');

/**
 * Whether the command line should start again with huge pages: on Linux, unless GLIBC_TUNABLES already
 * says what to do about them (glibc.malloc.hugetlb=0 keeps them off).
 */
export function wantsHugePages(env: NodeJS.ProcessEnv, platform: NodeJS.Platform): boolean {
  return platform === 'linux' && !tunables(env).some((t) => t.startsWith(`${TUNABLE}=`));
}

/** `env` with glibc.malloc.hugetlb=1 in its GLIBC_TUNABLES, the other tunables kept as they were. */
export function withHugePages(env: NodeJS.ProcessEnv): NodeJS.ProcessEnv {
  const rest = tunables(env).filter((t) => !t.startsWith(`${TUNABLE}=`));
  return { ...env, GLIBC_TUNABLES: [...rest, `${TUNABLE}=1`].join(':') };
}
