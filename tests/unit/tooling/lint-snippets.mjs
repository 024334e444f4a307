// Lints code snippets as if they lived at the given paths, with the project's own ESLint config.
// Run by boundaries.test.ts in a child process (ESLint loads its config with import(), which jest's
// module sandbox does not allow). stdin: [{ filePath, code }]; stdout: [[{ ruleId, message }]].
import { ESLint } from "eslint";

let input = "";
for await (const chunk of process.stdin) input += chunk;
const snippets = JSON.parse(input);
const eslint = new ESLint({ cwd: process.cwd() });
const out = [];
for (const { filePath, code } of snippets) {
  const [result] = await eslint.lintText(code, { filePath });
  out.push(result.messages.map(({ ruleId, message }) => ({ ruleId, message })));
}
process.stdout.write(JSON.stringify(out));
