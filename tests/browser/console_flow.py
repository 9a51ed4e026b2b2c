#!/usr/bin/python3
"""The station console (`scaleproof serve`, docs/console.md) driven in a real headless chromium.

  /usr/bin/python3 tests/browser/console_flow.py --scaleproof BIN --work DIR
      [--source-dir ROOT] [--screenshots-to reports/sample/console] [--keep]

The whole operator flow of issue 13, through the element ids of the console contract only:
  1. `scaleproof demo --out DIR/demo` makes a store, the station's key and closed sessions;
  2. `scaleproof serve --listen 127.0.0.1:0 --db DIR/demo/store.db --key DIR/demo/keys/station.key`,
     the port read from its one start-up line;
  3. sessions list and search; open a session for the demo's rig GV-1 on scale QX-1;
  4. key the passes of data-demo/sessions/03-mis-keyed-reading.json as they were keyed (drive of
     ticket QX-4390 keyed 4400 where the scale showed 4040, data-demo/truth/), the first pass from
     the keyboard alone (Tab / Enter); a reading off the scale division is refused by name and
     nothing is stored;
  5. the desk names the flagged reading; void it and re-key it as ticket QX-4392 (4040): the
     verdict turns. The verdicts and flag codes expected are `scaleproof reconcile --json` on the
     same passes (one library, same words on every surface: RULES.md);
  6. plan chart, history with the void, ledger (rows and head as `scaleproof check-store` says);
  7. close the session, issue the signed report, download the PDF and its .sig, check them with
     `scaleproof verify --pubkey`; the verify page says it holds, and fails with one byte flipped;
  8. one form post with JavaScript off (chromium's managed content setting);
  9. SIGINT stops the server with exit 0; `scaleproof check-store` is clean afterwards.
Screenshots of every page go to DIR/screenshots; --screenshots-to copies one per page (COMMITTED
below) there, the committed set for the README. A failed step prints its name, the page's URL and text, and
exits 1. Exit 77 (ctest: skipped) only when the binary has no `serve` subcommand at all.
Needs Debian's chromium, chromium-driver and python3-selenium (scripts/setup-debian); selenium
4.8's Service API (shared/notes/libraries.md, "Browser console").
"""
import argparse
import copy
import glob
import json
import os
import re
import select
import shutil
import signal
import subprocess
import sys
import time
import urllib.request

from selenium import webdriver
from selenium.common.exceptions import NoSuchElementException, WebDriverException
from selenium.webdriver.chrome.service import Service
from selenium.webdriver.common.by import By
from selenium.webdriver.common.keys import Keys
from selenium.webdriver.support.ui import Select, WebDriverWait

CHROMEDRIVER = "/usr/bin/chromedriver"
START_LINE = re.compile(r"^scaleproof console: http://127\.0\.0\.1:(\d+)/$")
MIS_KEYED = "sessions/03-mis-keyed-reading.json"  # data-demo/, planted error in truth/03-...
RIG, SCALE = "GV-1", "QX-1"  # demo.json: the rig made from that session, the station's scale


# The committed set (reports/sample/console/, for the README): one shot per page and the two
# moments of the desk that matter; the build folder keeps every shot.
COMMITTED = ("01-sessions", "04-session-new", "07-desk-flag", "09-desk-re-keyed", "10-plan",
             "11-history", "12-ledger", "14-report-issued", "16-verify-holds", "17-verify-fails")


class StepFailed(Exception):
    pass


class Flow:
    def __init__(self, args):
        self.args = args
        self.work = os.path.abspath(args.work)
        self.shots = os.path.join(self.work, "screenshots")
        self.downloads = os.path.join(self.work, "downloads")
        self.server = None
        self.driver = None
        self.base = None
        self.step_name = "start"
        self.passed = []
        self.shot_names = []

    # ---- helpers -------------------------------------------------------------------------
    def sp(self, *argv, check=True, stdin=None):
        p = subprocess.run([self.args.scaleproof] + list(argv), capture_output=True, text=True,
                           input=stdin)
        if check and p.returncode != 0:
            raise StepFailed("scaleproof %s: exit %d\n%s%s" % (" ".join(argv), p.returncode,
                                                              p.stdout, p.stderr))
        return p

    def fail(self, msg):
        raise StepFailed(msg)

    def expect(self, cond, msg):
        if not cond:
            self.fail(msg)

    def browser(self, javascript=True):
        o = webdriver.ChromeOptions()
        for a in ("--headless=new", "--no-sandbox", "--disable-dev-shm-usage", "--disable-gpu",
                  "--window-size=1280,1000", "--lang=en-US", "--force-device-scale-factor=1"):
            o.add_argument(a)
        prefs = {"download.default_directory": self.downloads,
                 "download.prompt_for_download": False,
                 "download.directory_upgrade": True,
                 "safebrowsing.enabled": False}
        if not javascript:
            prefs["profile.managed_default_content_settings.javascript"] = 2
        o.add_experimental_option("prefs", prefs)
        d = webdriver.Chrome(service=Service(CHROMEDRIVER), options=o)
        d.set_page_load_timeout(30)
        try:  # headless downloads: also allow them through the DevTools protocol
            d.execute_cdp_cmd("Page.setDownloadBehavior",
                              {"behavior": "allow", "downloadPath": self.downloads})
        except WebDriverException:
            pass
        return d

    def get(self, path):
        self.driver.get(self.base + path.lstrip("/"))

    def el(self, css, within=None):
        try:
            return (within or self.driver).find_element(By.CSS_SELECTOR, css)
        except NoSuchElementException:
            self.fail("no element %s on %s" % (css, self.driver.current_url))

    def els(self, css, within=None):
        return (within or self.driver).find_elements(By.CSS_SELECTOR, css)

    def text(self):
        try:
            return self.driver.find_element(By.TAG_NAME, "body").text
        except WebDriverException:
            return "(no page text)"

    def shot(self, name):
        """Full-page screenshot: the window grown to the page's height for the shot."""
        d = self.driver
        h = d.execute_script("return Math.max(document.body.scrollHeight, "
                             "document.documentElement.scrollHeight)") if d.execute_script(
            "return !!document.body") else 1000
        d.set_window_size(1280, min(max(int(h) + 40, 600), 6000))
        path = os.path.join(self.shots, name + ".png")
        d.save_screenshot(path)
        d.set_window_size(1280, 1000)
        self.shot_names.append(name)

    def wait_for(self, cond, what, timeout=15):
        try:
            WebDriverWait(self.driver, timeout).until(lambda d: cond())
        except Exception:  # selenium's TimeoutException, or a lookup failing meanwhile
            self.fail("timed out waiting for " + what)

    def submit(self, form_css, button_css=None):
        """Submits a form by its submit button (as a person would) and waits for the new page."""
        form = self.el(form_css)
        old = self.driver.find_element(By.TAG_NAME, "html")
        button = self.el(button_css) if button_css else None
        if button is None:
            found = self.els("button[type=submit], input[type=submit], button:not([type])", form)
            self.expect(found, "form %s has no submit button" % form_css)
            button = found[0]
        button.click()
        self.wait_for(lambda: self._stale(old), "the page after submitting " + form_css)

    @staticmethod
    def _stale(element):
        try:
            element.tag_name
            return False
        except WebDriverException:
            return True

    def verdict(self):
        """The desk's verdict: <p id="verdict" data-verdict=...>, the first element in <main>."""
        first = self.driver.execute_script(
            "const m = document.querySelector('main'); return m && m.firstElementChild ? "
            "m.firstElementChild.id : null;")
        self.expect(first == "verdict", "the first element in <main> is %r, not #verdict" % first)
        return self.el("#verdict").get_attribute("data-verdict")

    def flags(self):
        return [(f.get_attribute("data-code"), f.text) for f in self.els("#flags li.flag")]

    def step(self, name, fn):
        self.step_name = name
        print("step: %s ..." % name, flush=True)
        fn()
        self.passed.append(name)
        print("step: %s ok" % name, flush=True)

    # ---- the oracle: the library's own answer on the same passes ---------------------------
    def reconcile_file(self, passes, name):
        session = copy.deepcopy(self.session_file)
        session["passes"] = passes
        path = os.path.join(self.work, name)
        with open(path, "w", encoding="utf-8") as f:
            json.dump(session, f, indent=2)
        p = self.sp("reconcile", path, "--json", check=False)
        try:
            r = json.loads(p.stdout)
        except ValueError:
            self.fail("reconcile --json on %s gave no JSON (exit %d): %s" % (
                path, p.returncode, p.stderr))
        return r

    # ---- steps ---------------------------------------------------------------------------
    def make_demo(self):
        self.demo = os.path.join(self.work, "demo")
        self.sp("demo", "--out", self.demo)
        self.db = os.path.join(self.demo, "store.db")
        self.key = os.path.join(self.demo, "keys", "station.key")
        pubs = glob.glob(os.path.join(self.demo, "keys", "*.pub.pem"))
        self.expect(os.path.exists(self.db) and os.path.exists(self.key) and pubs,
                    "demo wrote no store.db, keys/station.key or keys/*.pub.pem in " + self.demo)
        self.pubkey = pubs[0]
        with open(os.path.join(self.args.source_dir, "data-demo", MIS_KEYED), encoding="utf-8") as f:
            self.session_file = json.load(f)
        with open(os.path.join(self.args.source_dir, "data-demo", "truth",
                               os.path.basename(MIS_KEYED)), encoding="utf-8") as f:
            self.truth = json.load(f)

    def start_server(self):
        cmd = [self.args.scaleproof, "serve", "--listen", "127.0.0.1:0", "--db", self.db,
               "--key", self.key]
        self.server = subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=open(
            os.path.join(self.work, "serve.stderr"), "w"), text=True, bufsize=1)
        ready, _, _ = select.select([self.server.stdout], [], [], 20)
        self.expect(ready, "no start-up line from `%s` within 20 s" % " ".join(cmd))
        line = self.server.stdout.readline().rstrip("\n")
        m = START_LINE.match(line)
        self.expect(m, "start-up line %r is not 'scaleproof console: http://127.0.0.1:PORT/'"
                    % line)
        self.base = "http://127.0.0.1:%s/" % m.group(1)
        self.driver = self.browser()

    def headers(self):
        with urllib.request.urlopen(self.base + "sessions", timeout=10) as r:
            h = {k.lower(): v for k, v in r.getheaders()}
        for name in ("content-security-policy", "x-content-type-options", "referrer-policy"):
            self.expect(name in h, "GET /sessions has no %s header" % name)
        self.expect(h["x-content-type-options"].lower() == "nosniff",
                    "X-Content-Type-Options is %r" % h["x-content-type-options"])

    def sessions_page(self):
        self.get("/")
        self.expect(self.driver.current_url.rstrip("/").endswith("/sessions"),
                    "GET / landed on %s, not /sessions" % self.driver.current_url)
        rows = self.els("#sessions tr[data-session]")
        self.expect(len(rows) >= 5, "the demo store has its sessions; #sessions lists %d" % len(rows))
        # Every asset from the binary: no resource from another origin.
        foreign = self.driver.execute_script(
            "return performance.getEntriesByType('resource').map(e => e.name)"
            ".filter(n => !n.startsWith(location.origin));")
        self.expect(not foreign, "assets fetched from elsewhere: %s" % foreign)
        self.shot("01-sessions")
        search = self.el("form#search")
        q = self.el("input[name=q]", search)
        q.clear()
        q.send_keys("QX-4390")  # a ticket of the demo's mis-keyed session
        self.submit("form#search")
        rows = self.els("#sessions tr[data-session]")
        self.expect(1 <= len(rows) < 5, "search by ticket QX-4390 lists %d sessions" % len(rows))
        self.shot("02-sessions-search")

    def open_session(self):
        self.get("/rigs/new")
        self.el("form#add-rig textarea[name=rig_file]")
        self.shot("03-rig-add")
        self.get("/sessions/new")
        form = self.el("form#open-session")
        for name, want in (("rig", RIG), ("scale", SCALE)):
            sel = Select(self.el("select[name=%s]" % name, form))
            options = [(o.get_attribute("value"), o.text) for o in sel.options]
            pick = [i for i, (v, t) in enumerate(options) if v == want or want in t]
            self.expect(pick, "select %s has no %s: %s" % (name, want, options))
            sel.select_by_index(pick[0])
        self.el("input[name=label]", form).send_keys("browser test: mis-keyed drive")
        self.shot("04-session-new")
        self.submit("form#open-session")
        m = re.search(r"/sessions/(\d+)/?$", self.driver.current_url)
        self.expect(m, "open-session landed on %s, not /sessions/ID" % self.driver.current_url)
        self.session_id = m.group(1)
        self.el("form#pass-form")
        self.shot("05-desk-empty")

    def kind_option(self, select, kind):
        """The option of the kind select for a pass kind of the session file (the contract
        words the hitched pass "slack": either value is taken)."""
        options = [(o.get_attribute("value"), o.text) for o in Select(select).options]
        for value, text in options:
            if value == kind or (kind == "hitched" and value == "slack"):
                return value, text
        self.fail("select kind has no option for %s: %s" % (kind, options))

    def fill_pass(self, p):
        form = self.el("form#pass-form")
        kind = self.el("select[name=kind]", form)
        Select(kind).select_by_value(self.kind_option(kind, p["kind"])[0])
        for name in ("setting", "ticket", "weighed_at", "steer", "drive", "trailer"):
            value = p.get(name)
            fields = self.els("[name=%s]" % name, form)
            if not fields:
                self.expect(value is None, "pass form has no field %s" % name)
                continue
            f = fields[0]
            f.clear()
            if value is not None:
                f.send_keys(str(value))
        self.submit("form#pass-form", "#pass-submit")

    def key_by_keyboard(self, p):
        """The first pass from the keyboard alone: Tab from the top of the page into the pass
        form, type each field, Tab on, Enter on the submit button."""
        d = self.driver
        d.find_element(By.TAG_NAME, "body")
        d.execute_script("window.scrollTo(0,0); if (document.activeElement) "
                         "document.activeElement.blur();")
        active = lambda: d.switch_to.active_element  # noqa: E731
        tab = lambda: webdriver.ActionChains(d).send_keys(Keys.TAB).perform()  # noqa: E731
        for _ in range(120):
            tab()
            inside = d.execute_script(
                "const a = document.activeElement; return !!(a && a.closest('#pass-form'));")
            if inside:
                break
        else:
            self.fail("120 presses of Tab never reached a field of #pass-form")
        old = d.find_element(By.TAG_NAME, "html")
        typed = []
        for _ in range(40):
            a = active()
            if a.get_attribute("id") == "pass-submit":
                a.send_keys(Keys.ENTER)
                break
            name = a.get_attribute("name")
            if name in p and p[name] is not None:
                if a.tag_name == "select":
                    # A select takes typed letters (type-ahead) from the keyboard.
                    value, text = self.kind_option(a, p[name])
                    a.send_keys(text)
                    self.expect(a.get_attribute("value") == value,
                                "typing %r into select %s chose %r" % (
                                    text, name, a.get_attribute("value")))
                else:
                    a.send_keys(Keys.CONTROL, "a")
                    a.send_keys(Keys.DELETE)
                    a.send_keys(str(p[name]))
                typed.append(name)
            elif name in ("setting", "trailer"):
                a.send_keys(Keys.CONTROL, "a")
                a.send_keys(Keys.DELETE)
            tab()
        else:
            self.fail("Tab through #pass-form never reached #pass-submit")
        missing = [k for k in p if p[k] is not None and k not in typed]
        self.expect(not missing, "fields never reached by Tab in #pass-form: %s" % missing)
        self.wait_for(lambda: self._stale(old), "the desk after Enter on #pass-submit")

    def pass_row(self, ticket):
        rows = self.els("#passes tr[data-ticket='%s']" % ticket)
        self.expect(rows, "#passes has no row for ticket %s" % ticket)
        return rows[-1]

    def key_passes(self):
        passes = self.session_file["passes"]
        self.expected_before = self.reconcile_file(passes, "as-keyed.json")
        for i, p in enumerate(passes):
            entry = {k: p.get(k) for k in ("kind", "setting", "ticket", "weighed_at", "steer",
                                           "drive", "trailer")}
            if i == 0:
                self.key_by_keyboard(entry)
            elif i == 1:
                # A reading off the scale division is refused with the field named, nothing is
                # stored, and the desk keeps the values as keyed so they can be fixed.
                off = dict(entry, steer=entry["steer"] + 1)
                self.fill_pass(off)
                body = self.text()
                self.expect("steer" in body and "division" in body,
                            "a steer reading off the division was not refused by name")
                self.expect(not self.els("#passes tr[data-ticket='%s']" % p["ticket"]),
                            "the refused pass %s was stored" % p["ticket"])
                kept = self.el("form#pass-form [name=steer]").get_attribute("value")
                self.expect(kept == str(off["steer"]), "the desk dropped the keyed steer "
                            "reading (shows %r)" % kept)
                self.shot("06-desk-refused")
                self.fill_pass(entry)
            else:
                self.fill_pass(entry)
            self.pass_row(p["ticket"])
            self.shot("06-desk-pass-%d" % (i + 1))
        got = self.verdict()
        want = self.expected_before["verdict"]
        self.expect(got == want, "verdict after the passes as keyed is %r; reconcile says %r"
                    % (got, want))

    def see_flag(self):
        planted = self.truth["planted"]  # {"pass": "tensioned:2", "platform": "drive", ...}
        ticket = [p["ticket"] for p in self.session_file["passes"]
                  if p["kind"] == "tensioned" and p.get("setting") == "2"][0]
        self.bad_ticket = ticket
        flags = self.flags()
        want_codes = sorted(f["code"] for f in self.expected_before.get("flags", []))
        self.expect(sorted(c for c, _ in flags) == want_codes,
                    "flags on the desk %s; reconcile gives the codes %s" % (flags, want_codes))
        naming = [t for _, t in flags if ticket in t and planted["platform"] in t.lower()]
        self.expect(naming, "no flag names the %s reading of ticket %s: %s"
                    % (planted["platform"], ticket, flags))
        self.shot("07-desk-flag")

    def void_and_rekey(self):
        row = self.pass_row(self.bad_ticket)
        pass_id = row.get_attribute("data-pass")
        form = self.el("form.void", row)
        reason = "drive reading keyed wrong; re-weighed as QX-4392"
        self.el("input[name=reason]", form).send_keys(reason)
        old = self.driver.find_element(By.TAG_NAME, "html")
        found = self.els("button, input[type=submit]", form)
        self.expect(found, "the void form of pass %s has no button" % pass_id)
        found[0].click()
        self.wait_for(lambda: self._stale(old), "the desk after voiding pass " + pass_id)
        row = self.el("#passes tr[data-pass='%s']" % pass_id)
        self.expect("voided" in (row.get_attribute("class") or "").split(),
                    "pass %s is not marked voided" % pass_id)
        self.expect(not self.els("form.void", row), "voided pass %s still has a void form"
                    % pass_id)
        self.shot("08-desk-voided")
        passes = self.session_file["passes"]
        bad = [p for p in passes if p["ticket"] == self.bad_ticket][0]
        rekey = dict(bad, ticket="QX-4392", drive=self.truth["planted"]["was"],
                     weighed_at="2026-10-21T14:36:00-06:00")
        self.fill_pass({k: rekey.get(k) for k in ("kind", "setting", "ticket", "weighed_at",
                                                  "steer", "drive", "trailer")})
        self.pass_row("QX-4392")
        corrected = [p for p in passes if p["ticket"] != self.bad_ticket] + [rekey]
        self.expected_after = self.reconcile_file(corrected, "re-keyed.json")
        got = self.verdict()
        want = self.expected_after["verdict"]
        self.expect(got == want, "verdict after re-keying is %r; reconcile says %r" % (got, want))
        self.expect(got != self.expected_before["verdict"],
                    "the verdict did not turn: %r before and after" % got)
        codes = sorted(c for c, _ in self.flags())
        want_codes = sorted(f["code"] for f in self.expected_after.get("flags", []))
        self.expect(codes == want_codes, "flags after re-keying %s; reconcile gives %s"
                    % (codes, want_codes))
        self.expect(not [t for _, t in self.flags() if self.bad_ticket in t],
                    "a flag still names the voided ticket %s" % self.bad_ticket)
        self.shot("09-desk-re-keyed")

    def plan_history_ledger(self):
        self.get("/sessions/%s/plan" % self.session_id)
        svg = self.el("svg#plan-chart")
        self.expect(svg.get_attribute("role") == "img", "#plan-chart has no role=img")
        # Every rating the plan carries (the API's plan JSON) is drawn and named in the chart,
        # and so is the target moment.
        with urllib.request.urlopen(self.base + "api/sessions/%s/plan" % self.session_id,
                                    timeout=10) as r:
            plan = json.loads(r.read())
        words = self.driver.execute_script("return arguments[0].textContent;", svg)
        missing = [g["label"] for g in plan["ratings"]
                   if "%s %.0f" % (g["label"].split(" vs ")[-1], g["limit"]) not in words]
        self.expect(plan["ratings"] and not missing,
                    "ratings not drawn in #plan-chart: %s" % missing)
        if plan.get("target"):
            self.expect("target" in words, "#plan-chart does not mark the target")
        self.shot("10-plan")
        self.get("/sessions/%s/history" % self.session_id)
        body = self.text()
        self.expect(self.bad_ticket in body and "re-weighed as QX-4392" in body,
                    "the history shows no void of %s with its reason" % self.bad_ticket)
        self.shot("11-history")

    def ledger(self):
        self.get("/ledger")
        rows = self.el("#ledger-rows").text.strip()
        head = self.el("#ledger-head").text.strip()
        out = self.sp("check-store", "--db", self.db).stdout
        m = re.search(r"([\d,]+) rows, head ([0-9a-f]{64})", out)
        self.expect(m, "check-store printed no rows and head: %s" % out)
        self.expect(re.sub(r"[^\d]", "", rows) == m.group(1).replace(",", ""),
                    "ledger page says %r rows; check-store says %s" % (rows, m.group(1)))
        self.expect(head == m.group(2), "ledger head %r; check-store says %s" % (head, m.group(2)))
        self.shot("12-ledger")

    def close_and_report(self):
        self.get("/sessions/%s" % self.session_id)
        self.submit("form#close-session")
        self.shot("13-desk-closed")
        self.expect(not self.els("form#pass-form"), "a closed session still offers #pass-form")
        self.submit("form#issue-report")
        pdf_a = self.el("a#download-pdf")
        sig_a = self.el("a#download-sig")
        self.shot("14-report-issued")
        os.makedirs(self.downloads, exist_ok=True)
        before = set(os.listdir(self.downloads))
        pdf_a.click()
        sig_a.click()

        def done():
            new = set(os.listdir(self.downloads)) - before
            finished = [n for n in new if not n.endswith(".crdownload")]
            return len(finished) >= 2 and not [n for n in new if n.endswith(".crdownload")]
        self.wait_for(done, "the PDF and .sig in %s" % self.downloads, timeout=30)
        new = sorted(set(os.listdir(self.downloads)) - before)
        pdfs = [n for n in new if n.endswith(".pdf")]
        sigs = [n for n in new if n.endswith(".sig")]
        self.expect(len(pdfs) == 1 and len(sigs) == 1, "downloads: %s" % new)
        check = os.path.join(self.work, "check")
        os.makedirs(check, exist_ok=True)
        self.pdf = os.path.join(check, pdfs[0])
        shutil.copy(os.path.join(self.downloads, pdfs[0]), self.pdf)
        self.sig = self.pdf + ".sig"  # verify reads REPORT.sig beside the report
        shutil.copy(os.path.join(self.downloads, sigs[0]), self.sig)
        with open(self.pdf, "rb") as f:
            self.expect(f.read(5) == b"%PDF-", "the downloaded %s is not a PDF" % pdfs[0])

    def verify_cli(self):
        p = self.sp("verify", self.pdf, "--pubkey", self.pubkey, check=False)
        self.expect(p.returncode == 0, "scaleproof verify on the download: exit %d\n%s%s" % (
            p.returncode, p.stdout, p.stderr))
        # The report leads with the same verdict as the desk (page 1, poppler's pdftotext).
        want = self.expected_after["verdict"].replace("-", " ")
        page1 = subprocess.run(["pdftotext", "-l", "1", self.pdf, "-"], capture_output=True,
                               text=True).stdout
        self.expect(re.search(r"Verdict: %s\b" % re.escape(want), page1),
                    "page 1 of the report does not lead with 'Verdict: %s':\n%s" % (
                        want, page1[:1500]))

    def verify_page(self, pdf, sig, ok, shot):
        self.get("/verify")
        form = self.el("form#verify-form")
        self.expect(form.get_attribute("enctype") == "multipart/form-data",
                    "#verify-form enctype is %r" % form.get_attribute("enctype"))
        self.el("input[name=report]", form).send_keys(pdf)
        self.el("input[name=sig]", form).send_keys(sig)
        self.el("input[name=pubkey]", form).send_keys(self.pubkey)
        if not ok:
            self.shot("15-verify-form")
        self.submit("form#verify-form")
        v = self.el("#verify-verdict")
        got = v.get_attribute("data-ok")
        self.expect(got == ("true" if ok else "false"),
                    "verify page data-ok=%r for %s" % (got, os.path.basename(pdf)))
        rows = self.els("#verify-checks tr")
        self.expect(rows, "no #verify-checks rows")
        if not ok:
            self.expect(re.search(r"fail", self.el("#verify-checks").text, re.I),
                        "no check says failed for the flipped byte")
        self.shot(shot)

    def verify_pages(self):
        self.verify_page(self.pdf, self.sig, True, "16-verify-holds")
        with open(self.pdf, "rb") as f:
            data = bytearray(f.read())
        # One byte in the middle of the file (the pages' content), flipped.
        at = len(data) // 2
        data[at] ^= 0x01
        flipped = os.path.join(self.work, "check", "flipped.pdf")
        with open(flipped, "wb") as f:
            f.write(bytes(data))
        p = self.sp("verify", flipped, "--pubkey", self.pubkey, check=False)
        self.expect(p.returncode != 0, "scaleproof verify accepts the flipped byte")
        self.verify_page(flipped, self.sig, False, "17-verify-fails")

    def javascript_off(self):
        d = self.browser(javascript=False)
        main, self.driver = self.driver, d
        try:
            self.get("/sessions/new")
            form = self.el("form#open-session")
            for name, want in (("rig", RIG), ("scale", SCALE)):
                sel = Select(self.el("select[name=%s]" % name, form))
                pick = [i for i, o in enumerate(sel.options)
                        if o.get_attribute("value") == want or want in o.text]
                self.expect(pick, "select %s has no %s" % (name, want))
                sel.select_by_index(pick[0])
            self.submit("form#open-session")
            m = re.search(r"/sessions/(\d+)/?$", d.current_url)
            self.expect(m, "with JavaScript off, open-session landed on %s" % d.current_url)
            p = self.session_file["passes"][0]
            self.fill_pass({k: p.get(k) for k in ("kind", "setting", "ticket", "weighed_at",
                                                  "steer", "drive", "trailer")})
            self.pass_row(p["ticket"])
            self.shot("18-desk-javascript-off")
        finally:
            d.quit()
            self.driver = main

    def stop_server(self):
        self.driver.quit()
        self.driver = None
        self.server.send_signal(signal.SIGINT)
        try:
            rc = self.server.wait(timeout=15)
        except subprocess.TimeoutExpired:
            self.server.kill()
            self.fail("serve did not stop within 15 s of SIGINT")
        self.server = None
        self.expect(rc == 0, "serve exited %d after SIGINT (stderr: %s)" % (
            rc, open(os.path.join(self.work, "serve.stderr")).read()[-2000:]))
        self.sp("check-store", "--db", self.db)

    def run(self):
        steps = [
            ("demo store", self.make_demo),
            ("start the console", self.start_server),
            ("security headers", self.headers),
            ("sessions page and search", self.sessions_page),
            ("open a session", self.open_session),
            ("key the passes as keyed (first by keyboard)", self.key_passes),
            ("flag names the mis-keyed reading", self.see_flag),
            ("void and re-key: the verdict turns", self.void_and_rekey),
            ("plan chart and history", self.plan_history_ledger),
            ("ledger as check-store says", self.ledger),
            ("close, issue the report, download PDF and .sig", self.close_and_report),
            ("scaleproof verify on the download", self.verify_cli),
            ("verify page: holds, and fails with a flipped byte", self.verify_pages),
            ("a form post with JavaScript off", self.javascript_off),
            ("SIGINT stops the console with exit 0", self.stop_server),
        ]
        try:
            for name, fn in steps:
                self.step(name, fn)
        except (StepFailed, WebDriverException, OSError) as e:
            print("\nFAILED step: %s\n%s" % (self.step_name, e), file=sys.stderr)
            if self.driver is not None:
                try:
                    print("page: %s\n---- page text ----\n%s\n-------------------" % (
                        self.driver.current_url, self.text()[:4000]), file=sys.stderr)
                    self.driver.save_screenshot(os.path.join(self.shots, "failed.png"))
                except WebDriverException:
                    pass
            print("passed steps: %s" % ", ".join(self.passed), file=sys.stderr)
            return 1
        finally:
            if self.driver is not None:
                self.driver.quit()
            if self.server is not None:
                self.server.kill()
                self.server.wait()
        if self.args.screenshots_to:
            dest = os.path.abspath(self.args.screenshots_to)
            os.makedirs(dest, exist_ok=True)
            for old in glob.glob(os.path.join(dest, "*.png")):
                os.remove(old)
            for name in self.shot_names:
                if name in COMMITTED:
                    shutil.copy(os.path.join(self.shots, name + ".png"), dest)
            print("screenshots copied to %s" % dest)
        print("console flow: all %d steps passed; screenshots in %s" % (len(self.passed),
                                                                         self.shots))
        return 0


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--scaleproof", default=os.environ.get("SCALEPROOF"))
    ap.add_argument("--source-dir", default=os.environ.get(
        "SOURCE_DIR", os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(
            __file__))))))
    ap.add_argument("--work", required=True)
    ap.add_argument("--screenshots-to", default=None)
    args = ap.parse_args()
    if not args.scaleproof:
        ap.error("--scaleproof (or $SCALEPROOF) is required")
    probe = subprocess.run([args.scaleproof, "--help"], capture_output=True, text=True)
    if not re.search(r"^\s+serve\s", probe.stdout, re.M):
        print("console_flow: %s has no serve subcommand: skipped" % args.scaleproof)
        return 77
    if os.path.exists(args.work):
        shutil.rmtree(args.work)
    for sub in ("screenshots", "downloads"):
        os.makedirs(os.path.join(args.work, sub))
    return Flow(args).run()


if __name__ == "__main__":
    sys.exit(main())
