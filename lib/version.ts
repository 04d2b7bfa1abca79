import packageJson from "../package.json" with { type: "json" };

/** Code version recorded with every analysis: package version plus the git commit when known. */
export function codeVersion(): string {
  const commit = process.env.SIDEREA_GIT_COMMIT?.slice(0, 12);
  return commit ? `${packageJson.version}+${commit}` : packageJson.version;
}
