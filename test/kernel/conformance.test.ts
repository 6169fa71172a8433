/**
 * Kernel conformance with Jupyter's own test suite: Debian's python3-jupyter-kernel-test drives a
 * real `helicoid` kernel (started by jupyter_client from the installed kernelspec) and validates
 * every message against the messaging-spec schema. Every test of the suite has samples (history of
 * every kind, the pager, invalid code, completion, inspection, display data, clear output) and no
 * test may be skipped. (This release of the suite has no stdin test.)
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { installKernelspec } from "../helpers/kernel.js";
import { systemPython } from "../helpers/python.js";

const suite = String.raw`
import json, sys, unittest, jupyter_kernel_test as jkt
from jupyter_kernel_test.msgspec_v5 import validate_message

class HelicoidConformance(jkt.KernelTests):
    kernel_name = "helicoid"
    language_name = "typescript"
    file_extension = ".ts"
    code_hello_world = 'console.log("hello, world")'
    code_stderr = 'console.error("to stderr")'
    code_generate_error = 'throw new Error("on purpose")'
    code_execute_result = [
        {"code": "6 * 7", "result": "42"},
        {"code": "'he' + 'licoid'", "result": "'helicoid'"},
    ]
    code_display_data = [
        {"code": 'import { display } from "@helicoid/kernel"; display("shown")', "mime": "text/plain"},
        {"code": 'import { markdown, display } from "@helicoid/kernel"; display(markdown("# title"))', "mime": "text/markdown"},
    ]
    code_clear_output = 'import { clearOutput } from "@helicoid/kernel"; console.log("x"); clearOutput()'
    completion_samples = [{"text": "Math.ab"}]
    complete_code_samples = ["1 + 1", "const a = 1;", "function f() { return 1; }"]
    incomplete_code_samples = ["function f() {", "const s = [", "if (a) {\n  b();"]
    invalid_code_samples = ["const 1x = 2", "let = 7q", "}"]
    code_inspect_sample = "Math"
    code_page_something = "Math.max?"
    # matches "6 * 7" of code_execute_result (a glob, as ipykernel's history search takes)
    code_history_pattern = "6 ?*"
    supported_history_operations = ("tail", "range", "search")

    def test_comm_info(self):
        self.flush_channels()
        msg_id = self.kc.comm_info()
        reply = self.get_non_kernel_info_reply(timeout=jkt.TIMEOUT)
        validate_message(reply, "comm_info_reply", msg_id)
        self.assertEqual(reply["content"]["status"], "ok")
        # Comm messages are not in the conformance schema, so drain iopub without validating them.
        exec_id = self.kc.execute('import { slider } from "@helicoid/kernel"; const s = slider({ min: 0, max: 1 }); s.id')
        reply = self.get_non_kernel_info_reply(timeout=jkt.TIMEOUT)
        validate_message(reply, "execute_reply", exec_id)
        self.assertEqual(reply["content"]["status"], "ok")
        seen_open = False
        while True:
            msg = self.kc.get_iopub_msg(timeout=jkt.TIMEOUT)
            seen_open = seen_open or msg["msg_type"] == "comm_open"
            if msg["msg_type"] == "status" and msg["content"]["execution_state"] == "idle" and msg["parent_header"].get("msg_id") == exec_id:
                break
        self.assertTrue(seen_open)
        msg_id = self.kc.comm_info(target_name="jupyter.widget")
        reply = self.get_non_kernel_info_reply(timeout=jkt.TIMEOUT)
        validate_message(reply, "comm_info_reply", msg_id)
        comms = reply["content"]["comms"]
        self.assertGreaterEqual(len(comms), 1)
        self.assertTrue(all(c["target_name"] == "jupyter.widget" for c in comms.values()))
        msg_id = self.kc.comm_info(target_name="no.such.target")
        reply = self.get_non_kernel_info_reply(timeout=jkt.TIMEOUT)
        self.assertEqual(reply["content"]["comms"], {})

if __name__ == "__main__":
    suite = unittest.defaultTestLoader.loadTestsFromTestCase(HelicoidConformance)
    result = unittest.TextTestRunner(verbosity=2).run(suite)
    summary = {
        "run": result.testsRun,
        "failures": len(result.failures),
        "errors": len(result.errors),
        "skipped": [f"{t.id()}: {why}" for t, why in result.skipped],
    }
    print("SUMMARY " + json.dumps(summary))
    sys.exit(0 if result.wasSuccessful() else 1)
`;

describe("kernel conformance (jupyter_kernel_test)", () => {
  it("passes the message-spec conformance suite", () => {
    const { jupyterPath } = installKernelspec();
    const dir = mkdtempSync(join(tmpdir(), "helicoid-jkt-"));
    const file = join(dir, "test_helicoid_kernel.py");
    writeFileSync(file, suite);
    const r = spawnSync(systemPython, [file], {
      cwd: dir,
      encoding: "utf8",
      env: { ...process.env, JUPYTER_PATH: jupyterPath, JUPYTER_RUNTIME_DIR: join(dir, "runtime") },
      timeout: 240_000,
    });
    const log = `${r.stdout}\n${r.stderr}`;
    expect(r.status, log).toBe(0);
    // Every test of the suite ran with samples and none was skipped (subtests included).
    const summary = JSON.parse(/SUMMARY (.*)/.exec(log)?.[1] ?? "null") as { run: number; failures: number; errors: number; skipped: string[] } | null;
    expect(summary, log).not.toBeNull();
    expect(summary!.skipped, log).toEqual([]);
    expect(summary!.failures + summary!.errors, log).toBe(0);
    expect(summary!.run, log).toBeGreaterThanOrEqual(13);
    for (const t of [
      "test_comm_info",
      "test_execute_result",
      "test_display_data",
      "test_history",
      "test_pager",
      "test_is_complete",
      "test_inspect",
      "test_completion",
      "test_clear_output",
    ]) {
      expect(log).toMatch(new RegExp(`${t} .* ok`));
    }
  });
});
