/**
 * One design's page: the form, the live result, and freezing.
 * Every change recomputes after a short pause through the preview endpoint
 * (nothing stored); a newer change aborts the older request. Freezing posts
 * the same inputs to the calculations endpoint.
 */
import { type CalculationRecord, type DesignEntry, type FieldError, type Preview, type Problem, callApi } from "./api.js";
import { frozenElement } from "./freeze.js";
import { h, replaceChildren } from "./dom.js";
import { previewBody, previewHead } from "./results.js";
import { SchemaForm } from "./schemaForm.js";
import { stageTitle } from "./stages.js";

const PAUSE_MS = 350;
/** Quick answers never flash a progress bar. */
const PROGRESS_AFTER_MS = 400;

export async function startDesignPage(root: HTMLElement): Promise<void> {
  const id = new URLSearchParams(location.search).get("id") ?? "";
  const answer = id ? await callApi<DesignEntry>(`/api/v1/designs/${encodeURIComponent(id)}`) : null;
  if (!answer || !answer.ok) {
    document.title = "Design not found · Trialwright";
    replaceChildren(root,
      h("h1", {}, "Design not found"),
      h("p", {}, id ? `The catalog has no design called “${id}”.` : "No design was named in the address."),
      h("p", {}, h("a", { href: "/" }, "See every design")));
    return;
  }
  new DesignPage(root, answer.body);
}

class DesignPage {
  private readonly form: SchemaForm;
  private readonly formElement: HTMLFormElement;
  private readonly summary: HTMLElement;
  private readonly status: HTMLElement;
  private readonly progress: HTMLElement;
  private readonly elapsed: HTMLElement;
  private readonly problem: HTMLElement;
  private readonly head: HTMLElement;
  private readonly body: HTMLElement;
  private readonly freezeButton: HTMLButtonElement;
  private readonly labelInput: HTMLInputElement;
  private readonly frozen: HTMLElement;
  private readonly result: HTMLElement;
  private timer: ReturnType<typeof setTimeout> | undefined;
  private running: { controller: AbortController; started: number; ticker: ReturnType<typeof setInterval> } | null = null;
  private hasResult = false;

  constructor(root: HTMLElement, private readonly design: DesignEntry) {
    document.title = `${design.title} · Trialwright`;
    this.form = new SchemaForm(design.inputSchema);
    this.form.write(design.example);
    this.summary = h("div", { class: "form-summary", id: "form-summary", tabindex: -1, hidden: true });
    const compute = h("button", { type: "submit" }, "Compute now");
    const reset = h("button", { type: "button", class: "quiet" }, "Back to the example");
    this.formElement = h("form", { id: "inputs", class: "inputs", novalidate: true, "aria-labelledby": "inputs-heading" },
      h("h2", { id: "inputs-heading" }, "Inputs"),
      h("p", { class: "help" }, "Results follow your changes. Every field is explained below its name."),
      h("p", { class: "jump" }, h("a", { href: "#result" }, "Go to the result")),
      this.summary, this.form.element,
      h("div", { class: "form-actions" }, compute, reset));
    this.status = h("p", { id: "status", class: "status", role: "status" });
    const cancel = h("button", { type: "button", id: "cancel", class: "small" }, "Cancel");
    this.elapsed = h("span", { class: "elapsed" });
    this.progress = h("div", { id: "progress", class: "progress", hidden: true },
      h("progress", { "aria-label": "Computing" }), this.elapsed, cancel);
    this.problem = h("div", { id: "problem", class: "problem", hidden: true });
    this.head = h("div", { id: "preview-head" });
    this.body = h("div", { id: "preview-body" });
    this.labelInput = h("input", { id: "label", type: "text", maxlength: 300, autocomplete: "off", "aria-describedby": "label-help" });
    this.freezeButton = h("button", { type: "button", id: "freeze-button", disabled: true }, "Freeze this design");
    this.frozen = h("div", { id: "frozen", "aria-live": "polite" });
    const freezeBox = h("section", { class: "freeze", id: "freeze", "aria-labelledby": "freeze-heading" },
      h("h2", { id: "freeze-heading" }, "Keep it"),
      h("p", { class: "help" }, "Freezing stores this exact calculation under a permanent link that you can cite in a protocol or a grant."),
      h("label", { for: "label" }, "Study label", h("span", { class: "optional" }, " (optional)")),
      h("p", { class: "help", id: "label-help" }, "Shown as the report’s title, for example “TW-417 phase II, site group B”. Part of the link."),
      h("div", { class: "with-button" }, this.labelInput, this.freezeButton),
      this.frozen);
    this.result = h("section", { id: "result", class: "result", tabindex: -1, "aria-labelledby": "result-heading" },
      h("h2", { id: "result-heading" }, "Result"), this.status, this.progress, this.problem,
      h("p", { class: "stale-note" }, "Out of date: the numbers below are for the last inputs that gave a result."), this.head, freezeBox, this.body);
    replaceChildren(root,
      h("nav", { class: "crumbs", "aria-label": "Breadcrumb" }, h("a", { href: "/" }, "All designs"), h("span", { "aria-hidden": "true" }, " / "), stageTitle(design.stage)),
      h("h1", {}, design.title),
      h("p", { class: "summary" }, design.summary),
      h("div", { class: "workspace" }, this.formElement, this.result));

    this.formElement.addEventListener("input", () => this.changed());
    this.formElement.addEventListener("change", () => this.changed());
    this.formElement.addEventListener("submit", (event) => {
      event.preventDefault();
      this.run();
    });
    reset.addEventListener("click", () => {
      this.form.write(design.example);
      this.changed();
    });
    cancel.addEventListener("click", () => this.cancel());
    this.freezeButton.addEventListener("click", () => void this.freeze());
    this.summary.addEventListener("click", (event) => {
      const link = (event.target as Element).closest("a[data-control]");
      if (!link) return;
      event.preventDefault();
      document.getElementById(link.getAttribute("data-control")!)?.focus();
    });
    this.run();
  }

  private say(message: string): void {
    this.status.textContent = message;
  }

  private changed(): void {
    clearTimeout(this.timer);
    this.timer = setTimeout(() => this.run(), PAUSE_MS);
    const note = this.frozen.querySelector(".frozen");
    if (note && !note.querySelector(".changed")) {
      note.prepend(h("p", { class: "changed" }, "The inputs have changed since this was frozen; the link below keeps the earlier ones."));
    }
  }

  private stopRunning(): void {
    if (!this.running) return;
    clearInterval(this.running.ticker);
    this.running.controller.abort();
    this.running = null;
    this.progress.hidden = true;
    this.result.removeAttribute("aria-busy");
  }

  private cancel(): void {
    this.stopRunning();
    if (this.hasResult) this.result.classList.add("stale");
    this.say(this.hasResult ? "Stopped. The result shown is for earlier inputs." : "Stopped. Change an input or press “Compute now” to start again.");
    this.formElement.querySelector<HTMLButtonElement>("button[type=submit]")?.focus();
  }

  private run(): void {
    clearTimeout(this.timer);
    this.stopRunning();
    const { values, problems } = this.form.read();
    if (problems.length > 0) {
      this.showFieldErrors(problems, "Fix the marked fields to see a result.");
      return;
    }
    const controller = new AbortController();
    const started = performance.now();
    const ticker = setInterval(() => {
      const ms = performance.now() - started;
      if (ms < PROGRESS_AFTER_MS) return;
      this.progress.hidden = false;
      this.elapsed.textContent = `Computing… ${Math.floor(ms / 1000)} s`;
    }, 200);
    this.running = { controller, started, ticker };
    this.result.setAttribute("aria-busy", "true");
    this.say("Computing…");
    callApi<Preview>(`/api/v1/designs/${encodeURIComponent(this.design.id)}/previews`, { body: { inputs: values }, signal: controller.signal })
      .then((answer) => {
        if (this.running?.controller !== controller) return;
        this.stopRunning();
        if (answer.ok) this.showPreview(answer.body);
        else this.showProblem(answer.problem);
      })
      .catch((error: unknown) => {
        if (controller.signal.aborted) return;
        if (this.running?.controller === controller) this.stopRunning();
        this.showProblem({ type: "about:blank", title: "No answer", status: 0, detail: `The service could not be reached (${error instanceof Error ? error.message : "network error"}). Check the connection and press “Compute now”.` });
      });
  }

  private showPreview(preview: Preview): void {
    this.form.clearErrors();
    this.summary.hidden = true;
    this.problem.hidden = true;
    replaceChildren(this.head, previewHead(preview));
    replaceChildren(this.body, previewBody(preview, (m) => this.say(m)));
    this.hasResult = true;
    this.result.classList.remove("stale");
    this.freezeButton.disabled = false;
    this.say("Up to date.");
  }

  private showProblem(problem: Problem): void {
    if (problem.status === 400 && problem.errors && problem.errors.length > 0) {
      this.showFieldErrors(problem.errors, "Fix the marked fields to see a result.");
      return;
    }
    // Valid inputs that cannot be computed (422): mark the fields the answer names, explain above the result.
    this.form.clearErrors();
    this.summary.hidden = true;
    const field = typeof problem.field === "string" ? problem.field : undefined;
    const marks = problem.errors && problem.errors.length > 0 ? problem.errors : field ? [{ path: `inputs.${field}`, pointer: `/inputs/${field}`, message: problem.detail }] : [];
    if (marks.length > 0) this.form.showErrors(marks);
    replaceChildren(this.problem, h("p", { class: "problem-title" }, problem.title), h("p", {}, problem.detail));
    this.problem.hidden = false;
    if (this.hasResult) this.result.classList.add("stale");
    this.say(problem.status === 422 ? problem.title : "No result.");
  }

  private showFieldErrors(errors: FieldError[], message: string): void {
    const placed = this.form.showErrors(errors);
    const items = placed.map((e) => {
      const key = e.pointer.split("/")[2] ?? "";
      const text = `${key ? `${this.form.labelFor(key)}: ` : ""}${e.message}`;
      return h("li", {}, e.controlId ? h("a", { href: `#${e.controlId}`, "data-control": e.controlId }, text) : text);
    });
    replaceChildren(this.summary, h("p", { class: "summary-title" }, errors.length === 1 ? "One field needs attention" : `${errors.length} fields need attention`), h("ul", {}, ...items));
    this.summary.hidden = false;
    this.problem.hidden = true;
    if (this.hasResult) this.result.classList.add("stale");
    this.say(message);
  }

  private async freeze(): Promise<void> {
    const { values, problems } = this.form.read();
    if (problems.length > 0) {
      this.showFieldErrors(problems, "Fix the marked fields before freezing.");
      this.summary.focus();
      return;
    }
    this.freezeButton.disabled = true;
    this.say("Freezing…");
    try {
      const label = this.labelInput.value.trim();
      const answer = await callApi<CalculationRecord>(`/api/v1/designs/${encodeURIComponent(this.design.id)}/calculations`, { body: { inputs: values, ...(label ? { label } : {}) } });
      if (!answer.ok) {
        if (answer.problem.frozen === false) {
          // Storage failed after computing: the result on screen stands, only the link is missing.
          const retry = typeof answer.problem.retryAfterSeconds === "number" ? ` in ${answer.problem.retryAfterSeconds} seconds` : " later";
          replaceChildren(this.frozen, h("div", { class: "problem not-frozen" },
            h("p", { class: "problem-title" }, answer.problem.title),
            h("p", {}, `The result shown was computed but could not be stored, so it has no permanent link yet. Try freezing again${retry}: the same inputs and title will get the same link.`)));
          this.say("Not frozen: storage is unavailable.");
          return;
        }
        if (answer.problem.errors?.some((e) => e.pointer === "/label")) {
          replaceChildren(this.frozen, h("p", { class: "field-error" }, answer.problem.errors.find((e) => e.pointer === "/label")!.message));
          this.labelInput.setAttribute("aria-invalid", "true");
          this.labelInput.focus();
        } else {
          this.showProblem(answer.problem);
          if (!this.summary.hidden) this.summary.focus();
        }
        this.say("Not frozen.");
        return;
      }
      this.labelInput.removeAttribute("aria-invalid");
      replaceChildren(this.frozen, frozenElement(this.design, answer.body, answer.status === 201, (m) => this.say(m)));
      this.say(answer.status === 201 ? "Frozen under a permanent link." : "Already frozen; here is its link.");
      document.getElementById("frozen-heading")?.focus();
    } catch (error) {
      this.say(`Not frozen: the service could not be reached (${error instanceof Error ? error.message : "network error"}).`);
    } finally {
      this.freezeButton.disabled = false;
    }
  }
}
