/*
 * explore.js - the page of `deltak explore`.
 *
 * The page computes nothing: every number and figure is the answer of a
 * deltak command, asked through /api/<command> (its --json output) and
 * /figure/<command>.<fmt> (its --plot output), with the query parameters
 * as the command's options. The state of the design lives in the address
 * (after '#'), so that a design can be bookmarked and shared; the same
 * calls are shown as command lines and saved as a design file for
 * `deltak run`.
 */
"use strict";

const $ = (id) => document.getElementById(id);

/* The design, as in the address. Empty period/theta: take the design's. */
const DEFAULTS = {
    crystal: "MgO:LN", dispersion: "", scheme: "qpm", process: "mix",
    pump: "1064nm", idler: "3.4um", fundamental: "1064nm", type: "I",
    temp: "40", period: "", theta: "", length: "20", tune: "",
};
const state = Object.assign({}, DEFAULTS);
let crystals = [];              /* from /api/crystals */
let generation = 0;             /* the newest update; older ones stop */
let controller = null;          /* aborts the fetches of an old update */
let timer = null;
const figures = {};             /* name -> {call, url} of the shown figure */
const objectUrls = {};

/* ---- State in the address ------------------------------------------ */

function readAddress() {
    const p = new URLSearchParams(location.hash.slice(1));
    for (const k of Object.keys(DEFAULTS))
        state[k] = p.has(k) ? p.get(k) : DEFAULTS[k];
}

function writeAddress() {
    const p = new URLSearchParams();
    for (const k of Object.keys(DEFAULTS))
        if (state[k] !== "")
            p.set(k, state[k]);
    history.replaceState(null, "", "#" + p.toString());
}

/* ---- Calls: one command each ---------------------------------------- */

/* A command with its options as [name, value] pairs (value "" for a
 * flag). @helper: shown, but not written into design files. */
function call(command, options, helper) {
    return {command, options: options.filter((o) => o[1] !== null &&
                                                    o[1] !== undefined),
            helper: !!helper};
}

function query(c) {
    const p = new URLSearchParams();
    for (const [k, v] of c.options)
        p.append(k, v);
    return p.toString();
}

const apiUrl = (c) => "/api/" + c.command + "?" + query(c);
const figureUrl = (c, format) =>
    "/figure/" + c.command + "." + format + "?" + query(c);

function shellWord(v) {
    return /^[A-Za-z0-9_.,:=+\-\/µ]+$/.test(v) ? v
                                               : '"' + v.replace(/"/g, "") + '"';
}

function commandLine(c, plot) {
    const words = [c.command];
    for (const [k, v] of c.options)
        words.push(v === "" ? "--" + k : "--" + k + " " + shellWord(v));
    if (plot)
        words.push("--plot " + plot);
    else if (c.command !== "crystals")
        words.push("--json");
    return words.join(" ");
}

async function getJson(c, signal) {
    let r;
    try {
        r = await fetch(apiUrl(c), {signal});
    } catch (e) {
        if (e.name === "AbortError")
            throw e;
        return {error: "the server does not answer (is deltak explore still running?)"};
    }
    let body = null;
    try {
        body = await r.json();
    } catch (e) {
        return {error: "not JSON (HTTP " + r.status + ")"};
    }
    if (!r.ok)
        return {error: body.error || "HTTP " + r.status};
    return {data: body};
}

function decodeNotes(header) {
    if (!header)
        return [];
    try {
        return decodeURIComponent(header).split("\n").filter((l) => l);
    } catch (e) {
        return [];
    }
}

async function showFigure(name, c, signal) {
    const box = $(name + "-img").parentElement;
    box.classList.add("waiting");
    const url = figureUrl(c, "svg");
    let r;
    try {
        r = await fetch(url, {signal});
    } catch (e) {
        if (e.name === "AbortError")
            throw e;
        return {error: "the server does not answer"};
    }
    if (!r.ok) {
        let msg = "HTTP " + r.status;
        try { msg = (await r.json()).error || msg; } catch (e) { /* keep */ }
        clearFigure(name);
        return {error: msg};
    }
    const blob = await r.blob();
    if (signal.aborted)
        throw new DOMException("stale", "AbortError");
    if (objectUrls[name])
        URL.revokeObjectURL(objectUrls[name]);
    objectUrls[name] = URL.createObjectURL(blob);
    const img = $(name + "-img");
    await new Promise((done) => {
        img.onload = img.onerror = done;
        img.src = objectUrls[name];
    });
    img.dataset.loaded = String(generation);
    box.classList.remove("waiting");
    figures[name] = {call: c};
    return {notes: decodeNotes(r.headers.get("X-Deltak-Notes"))};
}

function clearFigure(name) {
    const img = $(name + "-img");
    img.removeAttribute("src");
    img.parentElement.classList.remove("waiting");
    delete figures[name];
}

/* Nothing to analyse (no design): empty the other cards, say why. */
function clearAnalyses(why) {
    clearFigure("tuning");
    clearFigure("acceptance");
    setNotes("tuning-notes", []);
    showAcceptance({}, null);
    showPulse({error: why});
}

/* ---- Showing answers ------------------------------------------------- */

const um = (v) => v === null || v === undefined ? "–"
                                                : Number(v).toPrecision(6) + " µm";
const num = (v, digits, unit) => v === null || v === undefined
    ? "–" : Number(v).toPrecision(digits) + (unit ? " " + unit : "");

function flagText(flags) {
    if (!flags || !flags.length)
        return "";
    const words = flags.map((f) => f.replace(/^range:/, ""));
    return "outside the fitted range: " + words.join(", ");
}

function setNumbers(id, rows) {
    const dl = $(id);
    dl.replaceChildren();
    for (const [label, value, flags, key] of rows) {
        const dt = document.createElement("dt");
        dt.textContent = label;
        const dd = document.createElement("dd");
        dd.textContent = value;
        if (key)
            dd.dataset.key = key;
        const f = flagText(flags);
        if (f) {
            const span = document.createElement("span");
            span.className = "flag";
            span.textContent = f;
            dd.appendChild(span);
        }
        dl.append(dt, dd);
    }
}

/* Notes of a JSON answer (or figure header lines, or an error) as list
 * items: "assumed" for default choices, warnings and cautions marked. */
function setNotes(id, items) {
    const ul = $(id);
    ul.replaceChildren();
    const seen = new Set();
    for (const [kind, text] of items) {
        if (seen.has(text))
            continue;
        seen.add(text);
        const li = document.createElement("li");
        li.className = kind;
        li.textContent = (kind === "info" ? "" :
                          kind === "assumed" ? "assumed: " :
                          kind === "error" ? "error: " :
                          kind === "caution" ? "caution: " :
                          kind === "memory" ? "from memory: " :
                          "warning: ") + text;
        ul.appendChild(li);
    }
}

function notesOf(answer) {
    const items = [];
    if (!answer)
        return items;
    if (answer.error)
        return [["error", answer.error]];
    if (answer.notes && !answer.data) {
        for (const line of answer.notes) {
            const m = /^(note|warning|caution): (.*)$/.exec(line);
            if (m)
                items.push([m[1] === "note" ? "assumed" : m[1], m[2]]);
        }
        return items;
    }
    const d = answer.data || {};
    for (const n of d.notes || [])
        items.push([n.kind === "default" ? "assumed" : n.kind, n.text]);
    for (const w of d.warnings || [])
        if (!items.some((i) => i[1] === w))
            items.push(["warning", w]);
    return items;
}

function setTable(id, header, rows) {
    const t = $(id);
    t.replaceChildren();
    const tr = document.createElement("tr");
    for (const h of header) {
        const th = document.createElement("th");
        th.textContent = h;
        tr.appendChild(th);
    }
    t.appendChild(tr);
    for (const row of rows) {
        const r = document.createElement("tr");
        row.forEach((cell, i) => {
            const td = document.createElement("td");
            td.textContent = cell;
            if (i > 0)
                td.className = "num";
            r.appendChild(td);
        });
        t.appendChild(r);
    }
}

/* ---- The design's calls ------------------------------------------------ */

function base() {
    const o = [["crystal", state.crystal]];
    if (state.dispersion)
        o.push(["dispersion", state.dispersion]);
    return o;
}

function waves(idlerUm) {
    if (state.process === "shg")
        return [["fundamental", state.fundamental]];
    return [["pump", state.pump],
            ["idler", idlerUm !== undefined ? idlerUm + "um" : state.idler]];
}

const fixed = (v, d) => String(Number(Number(v).toFixed(d)));

function setSliderRange(id, centre, half, lo, hi, step) {
    const s = $(id);
    const min = Math.max(lo, centre - half), max = Math.min(hi, centre + half);
    s.min = fixed(min, 2);
    s.max = fixed(max, 2);
    s.step = step;
}

/* Keep the period (or angle) slider around the value it shows. */
function keepInRange(id, value, half, lo, hi, step) {
    const s = $(id);
    const v = Number(value);
    if (!(v >= Number(s.min) && v <= Number(s.max)))
        setSliderRange(id, Math.round(v), half, lo, hi, step);
    s.value = value;
}

function tuneChoices() {
    const sel = $("tune-x");
    const opts = state.scheme === "qpm"
        ? [["temp", "against temperature"], ["period", "against period"]]
        : [["theta", "against angle"], ["temp", "against temperature"]];
    if (!opts.some((o) => o[0] === state.tune))
        state.tune = opts[0][0];
    sel.replaceChildren(...opts.map(([v, t]) => {
        const o = document.createElement("option");
        o.value = v;
        o.textContent = t;
        return o;
    }));
    sel.value = state.tune;
}

async function update() {
    const gen = ++generation;
    if (controller)
        controller.abort();
    controller = new AbortController();
    const signal = controller.signal;
    const lines = [];
    const note = (c, plot) => lines.push({c, plot});
    $("status").textContent = "computing…";
    try {
        if (state.scheme === "qpm")
            await updateQpm(signal, note);
        else
            await updateAngle(signal, note);
        if (gen !== generation)
            return;
        $("command-lines").textContent = lines.map((l) =>
            "deltak " + commandLine(l.c, l.plot)).join("\n");
        designCalls = lines;
        $("status").textContent = "up to date";
        document.body.dataset.generation = String(gen);
        document.body.dataset.ready = "1";
    } catch (e) {
        if (e.name !== "AbortError")
            $("status").textContent = "error: " + e.message;
    }
}
let designCalls = [];

/* The tolerance, pulse and figure calls of the operating point. */
async function analyses(signal, note, operating, tuning, accCurve) {
    const L = ["length", state.length + "mm"];
    const tol = call("tolerance", [...operating, L]);
    const accFig = call("tolerance", [...operating, L, ["curve", accCurve]]);
    const pulse = call("pulse", [...operating, L]);
    note(tol);
    note(pulse);
    note(accFig, "acceptance.svg");
    note(tuning, "tuning.svg");
    const [t, p, af, tf] = await Promise.all([
        getJson(tol, signal), getJson(pulse, signal),
        showFigure("acceptance", accFig, signal),
        showFigure("tuning", tuning, signal)]);
    showAcceptance(t, af);
    showPulse(p);
    setNotes("tuning-notes", notesOf(tf));
}

function showAcceptance(t, fig) {
    const rows = [];
    if (t.data) {
        const d = t.data;
        rows.push(["length", num(d.length_mm, 4, "mm")]);
        if (d.temperature_fwhm_C !== undefined)
            rows.push(["temperature FWHM", num(d.temperature_fwhm_C, 4, "°C"),
                       null, "temperature_fwhm_C"]);
        const s = d.spectral_fwhm_nm || {};
        for (const w of ["signal", "idler", "pump"])
            if (s[w] !== undefined && s[w] !== null)
                rows.push([w + " FWHM", num(s[w], 4, "nm")]);
        const a = d.angular_fwhm_mrad || {};
        for (const k of Object.keys(a))
            if (a[k] !== null)
                rows.push([k + " FWHM (internal)", num(a[k], 4, "mrad")]);
        if (d.period_fwhm_nm !== undefined)
            rows.push(["period FWHM", num(d.period_fwhm_nm, 4, "nm")]);
    }
    setNumbers("acc-numbers", rows);
    setNotes("acc-notes", [...notesOf(t), ...notesOf(fig)]);
}

function showPulse(p) {
    if (!p.data) {
        setTable("gvm-table", ["", ""], []);
        setNotes("gvm-notes", notesOf(p));
        return;
    }
    const d = p.data;
    const L = Number(state.length);
    const rows = [];
    const gi = d.group_index || {};
    const shg = state.process === "shg";
    const names = shg ? {pump: "second harmonic", signal: "fundamental"}
                      : {pump: "pump", signal: "signal", idler: "idler"};
    for (const w of Object.keys(names))
        if (gi[w] !== undefined)
            rows.push(["group index, " + names[w], num(gi[w], 6), "",
                       num((d.gvd_fs2_per_mm || {})[w], 4)]);
    const gvm = d.gvm_fs_per_mm || {};
    const pairs = shg ? {signal_pump: "fundamental – SH"}
                      : {signal_pump: "signal – pump", idler_pump: "idler – pump",
                         signal_idler: "signal – idler"};
    for (const k of Object.keys(pairs))
        if (gvm[k] !== undefined && gvm[k] !== null)
            rows.push(["GVM " + pairs[k], num(gvm[k], 4),
                       num(gvm[k] * L, 4), ""]);
    setTable("gvm-table", ["", "fs/mm or n_g", "delay over L (fs)",
                           "GVD (fs²/mm)"], rows);
    const wo = d.walkoff_mrad || {};
    const items = notesOf(p);
    const woText = Object.keys(wo).filter((k) => wo[k])
        .map((k) => k.replace("_", "–") + " " + num(wo[k], 3, "mrad"));
    if (woText.length)
        items.unshift(["info", "spatial walk-off " + woText.join(", ")]);
    setNotes("gvm-notes", items);
}

async function updateQpm(signal, note) {
    const shg = state.process === "shg";
    const T = ["temp", state.temp];
    /* The grating the wanted waves need at this temperature. */
    const design = call("period", [...base(), ...waves(), T]);
    note(design);
    const dj = await getJson(design, signal);
    const opItems = notesOf(dj);
    let designPeriod = dj.data ? dj.data.period_um : null;
    if (designPeriod && state.period === "") {
        state.period = fixed(designPeriod, 2);
        writeAddress();
    }
    if (designPeriod)
        $("to-design").dataset.value = fixed(designPeriod, 2);
    if (state.period === "") {
        setNumbers("op-numbers", []);
        setNotes("op-notes", opItems);
        clearAnalyses("no design: see the operating point");
        return;
    }
    keepInRange("period", state.period, 3, 1, 200, 0.01);
    showSliders();
    const P = ["period", state.period + "um"];
    /* What the grating on the slider gives at the temperature on the
     * slider: signal and idler (or, for SHG, the phase-matching
     * temperatures). */
    const op = call("period", shg ? [...base(), ...waves(), P]
                                  : [...base(), ["pump", state.pump], P, T]);
    note(op);
    /* The oven temperature at which this grating gives the wanted idler. */
    const oven = shg ? null : call("period", [...base(), ...waves(), P]);
    if (oven)
        note(oven);
    const [oj, vj] = await Promise.all([getJson(op, signal),
                                        oven ? getJson(oven, signal) : null]);
    const rows = [];
    if (designPeriod !== null)
        rows.push([shg ? "period for SHG at " + state.temp + " °C"
                       : "period for the wanted idler",
                   num(designPeriod, 6, "µm"), dj.data.flags]);
    if (vj && vj.data) {
        const temps = (vj.data.solutions || []).map((x) => num(x.temperature_C, 5, "°C"));
        rows.push(["oven for the wanted idler", temps.join(", ") ||
                   num(vj.data.temperature_C, 5, "°C"), vj.data.flags,
                   "oven_C"]);
    } else if (vj) {
        rows.push(["oven for the wanted idler", "none in range"]);
    }
    let operating = null, tuning;
    if (oj.data) {
        const d = oj.data;
        if (shg) {
            const temps = (d.solutions || []).map((s) => num(s.temperature_C, 5, "°C"));
            rows.push(["phase-matching temperature", temps.join(", ") || num(d.temperature_C, 5, "°C"),
                       d.flags, "pm_temperature_C"]);
            rows.push(["second harmonic", um(d.wavelengths_um.pump)]);
            operating = [...base(), ...waves(), P, T];
        } else {
            const w = d.wavelengths_um;
            rows.push(["signal", um(w.signal), d.flags, "signal_um"]);
            rows.push(["idler", um(w.idler) + "  (" + num(1e4 / w.idler, 6, "cm⁻¹") + ")",
                       d.flags, "idler_um"]);
            if ((d.solutions || []).length > 1)
                rows.push(["other solutions", d.solutions.filter((s, i) => i !== d.chosen)
                           .map((s) => um(s.wavelengths_um.idler)).join(", ")]);
            operating = [...base(), ["pump", state.pump],
                         ["idler", fixed(w.idler, 9) + "um"], P, T];
        }
        rows.push(["d_eff", num(d.deff_pm_per_V, 3, "pm/V")]);
    }
    setNumbers("op-numbers", rows);
    setNotes("op-notes", [...opItems, ...notesOf(oj)]);
    const Pnum = Number(state.period);
    if (shg) {
        const f = dj.data ? dj.data.wavelengths_um.fundamental ||
                            dj.data.wavelengths_um.signal : 1.064;
        tuning = state.tune === "period"
            ? call("sweep", [...base(), ...waves(),
                             ["vary", "period=" + fixed(Pnum - 1, 2) + "um:" +
                                      fixed(Pnum + 1, 2) + "um:81"],
                             ["solve", "temp"]])
            : call("sweep", [...base(), ...waves(), P,
                             ["vary", "fundamental=" + fixed(f * 0.995, 5) + "um:" +
                                      fixed(f * 1.005, 5) + "um:81"],
                             ["solve", "temp"]]);
    } else {
        tuning = state.tune === "period"
            ? call("sweep", [...base(), ["pump", state.pump], T,
                             ["vary", "period=" + fixed(Pnum - 2, 2) + "um:" +
                                      fixed(Pnum + 2, 2) + "um:81"],
                             ["solve", "wavelengths"]])
            : call("sweep", [...base(), ["pump", state.pump], P, T,
                             ["vary", "temp=20:200:91"],
                             ["solve", "wavelengths"]]);
    }
    if (!operating)
        return showTuningAlone(signal, note, tuning, "no operating point");
    await analyses(signal, note, operating, tuning, "temperature");
}

async function updateAngle(signal, note) {
    const shg = state.process === "shg";
    const T = ["temp", state.temp];
    const type = ["type", state.type];
    const design = call("angle", [...base(), ...waves(), type, T]);
    note(design);
    const dj = await getJson(design, signal);
    const rows = [];
    let sol = null;
    if (dj.data && dj.data.solutions && dj.data.solutions.length) {
        sol = dj.data.solutions[dj.data.chosen || 0];
        $("to-design").dataset.value = fixed(sol.theta_deg, 2);
        if (state.theta === "") {
            state.theta = fixed(sol.theta_deg, 2);
            writeAddress();
        }
        rows.push(["θ for the wanted waves", num(sol.theta_deg, 6, "deg"),
                   null, "design_theta_deg"]);
        rows.push(["φ", num(sol.phi_deg, 5, "deg")]);
        rows.push(["modes (signal idler pump)", sol.pol + ", type " + sol.type]);
        rows.push(["d_eff", num(sol.deff_pm_per_V, 3, "pm/V")]);
    }
    const opItems = notesOf(dj);
    if (!sol || state.theta === "") {
        setNumbers("op-numbers", rows);
        setNotes("op-notes", opItems);
        clearAnalyses("no design: see the operating point");
        return;
    }
    keepInRange("theta", state.theta, 5, 0, 90, 0.01);
    showSliders();
    const th = Number(state.theta);
    const common = [...base(), ["scheme", "birefringent"], ["pol", sol.pol], T];
    let operating, tuning;
    if (shg) {
        operating = [...base(), ...waves(), type, ["theta", state.theta], T];
        const f = dj.data.wavelengths_um.fundamental || dj.data.wavelengths_um.signal;
        tuning = state.tune === "temp"
            ? call("sweep", [...common, ...waves(), ["vary", "temp=20:200:91"],
                             ["solve", "theta"]])
            : call("sweep", [...common, ...waves(),
                             ["vary", "fundamental=" + fixed(f * 0.9, 4) + "um:" +
                                      fixed(f * 1.1, 4) + "um:101"],
                             ["solve", "theta"]]);
    } else {
        /* Signal and idler where the crystal is turned to: the tuning
         * curve's engine at that one angle. */
        const at = call("sweep", [...common, ["pump", state.pump],
                                  ["vary", "theta=" + state.theta + ":" +
                                           fixed(th + 0.01, 4) + ":2"],
                                  ["solve", "wavelengths"]], true);
        note(at);
        const aj = await getJson(at, signal);
        let idler = null;
        if (aj.data) {
            const ser = aj.data.series || [];
            const s = ser.find((x) => x.branch === "signal");
            const i = ser.find((x) => x.branch === "idler");
            const sy = s ? s.y[0] : null, iy = i ? i.y[0] : null;
            rows.push(["at θ " + state.theta + " deg: signal", um(sy),
                       s && s.flags[0] ? [s.flags[0]] : null, "signal_um"]);
            rows.push(["idler", um(iy), i && i.flags[0] ? [i.flags[0]] : null,
                       "idler_um"]);
            idler = iy;
        }
        setNotes("op-notes", [...opItems, ...notesOf(aj)]);
        operating = idler ? [...base(), ["pump", state.pump],
                             ["idler", fixed(idler, 9) + "um"], type,
                             ["theta", state.theta], T] : null;
        tuning = state.tune === "temp"
            ? call("sweep", [...common, ["pump", state.pump], ["theta", state.theta],
                             ["vary", "temp=20:200:91"], ["solve", "wavelengths"]])
            : call("sweep", [...common, ["pump", state.pump],
                             ["vary", "theta=" + fixed(Math.max(0.1, th - 3), 2) + ":" +
                                      fixed(Math.min(89.9, th + 3), 2) + ":121"],
                             ["solve", "wavelengths"]]);
    }
    setNumbers("op-numbers", rows);
    if (shg)
        setNotes("op-notes", opItems);
    if (!operating)
        return showTuningAlone(signal, note, tuning,
                               "no signal and idler phase-match at this angle");
    await analyses(signal, note, operating, tuning, "theta");
}

/* No operating point: the tuning figure alone, the analyses emptied. */
async function showTuningAlone(signal, note, tuning, why) {
    note(tuning, "tuning.svg");
    const tf = await showFigure("tuning", tuning, signal);
    setNotes("tuning-notes", notesOf(tf));
    clearFigure("acceptance");
    showAcceptance({}, null);
    showPulse({error: why});
}

/* ---- Controls ---------------------------------------------------------- */

function showSliders() {
    for (const id of ["temp", "period", "theta", "length"])
        $(id + "-out").textContent = $(id).value;
}

function schedule(delay) {
    clearTimeout(timer);
    timer = setTimeout(update, delay);
}

function fillSets() {
    const c = crystals.find((x) => x.crystal === state.crystal);
    const sel = $("dispersion");
    const opts = [["", "the crystal's default"]];
    if (c)
        for (const s of c.sets)
            opts.push([s.dispersion, s.dispersion]);
    sel.replaceChildren(...opts.map(([v, t]) => {
        const o = document.createElement("option");
        o.value = v;
        o.textContent = t;
        return o;
    }));
    if (!opts.some((o) => o[0] === state.dispersion))
        state.dispersion = "";
    sel.value = state.dispersion;
    const poled = c && c.poling && c.poling !== "none";
    document.querySelector("input[value=qpm]").disabled = !poled;
    if (!poled && c)
        state.scheme = "angle";
}

function applyState() {
    /* Crystal names are matched as the command line matches them: id
     * or alias, any case. */
    const want = state.crystal.toLowerCase();
    const c = crystals.find((x) => x.crystal.toLowerCase() === want ||
                                   (x.aliases || []).some((a) => a.toLowerCase() === want));
    if (c)
        state.crystal = c.crystal;
    $("crystal").value = state.crystal;
    fillSets();
    for (const r of document.querySelectorAll("input[name=scheme]"))
        r.checked = r.value === state.scheme;
    for (const r of document.querySelectorAll("input[name=process]"))
        r.checked = r.value === state.process;
    for (const k of ["pump", "idler", "fundamental", "type"])
        $(k).value = state[k];
    $("temp").value = state.temp;
    $("length").value = state.length;
    if (state.period !== "")
        keepInRange("period", state.period, 3, 1, 200, 0.01);
    if (state.theta !== "")
        keepInRange("theta", state.theta, 5, 0, 90, 0.01);
    document.body.className = (state.scheme === "qpm" ? "qpm" : "angle") + " " +
                              (state.process === "shg" ? "shg" : "mix");
    tuneChoices();
    showSliders();
    writeAddress();
}

/* A change of crystal, scheme, process or waves starts again from the
 * design's own period or angle. */
function designChanged() {
    state.period = "";
    state.theta = "";
    applyState();
    schedule(0);
}

function download(blob, name) {
    const a = document.createElement("a");
    a.href = URL.createObjectURL(blob);
    a.download = name;
    document.body.appendChild(a);
    a.click();
    setTimeout(() => { URL.revokeObjectURL(a.href); a.remove(); }, 1000);
}

async function saveFigure(name, format) {
    const f = figures[name];
    if (!f)
        return;
    const r = await fetch(figureUrl(f.call, format));
    if (!r.ok) {
        $("status").textContent = "could not draw the figure (HTTP " + r.status + ")";
        return;
    }
    download(await r.blob(), "deltak-" + name + "." + format);
}

function designFile() {
    const title = "explore: " + state.crystal + ", " +
                  (state.scheme === "qpm" ? "QPM " : "birefringent ") +
                  (state.process === "shg" ? "SHG of " + state.fundamental
                                           : state.pump + " pump, " + state.idler + " idler");
    const out = [
        "# deltak design file, saved from the page of `deltak explore`.",
        "# Run it with: deltak run FILE (figures and report are written beside it).",
        "# Laser safety: Class 3B/4 beams, invisible in the mid-infrared; local rules",
        "# and your laser safety officer take precedence.",
        "title: " + title,
        "report: report.md",
        "# page state: #" + location.hash.slice(1),
    ];
    for (const l of designCalls)
        if (!l.c.helper)
            out.push(commandLine(l.c, l.plot));
    return out.join("\n") + "\n";
}

function bind() {
    $("crystal").addEventListener("change", (e) => {
        state.crystal = e.target.value;
        state.dispersion = "";
        const c = crystals.find((x) => x.crystal === state.crystal);
        if (c && c.poling && c.poling !== "none")
            state.scheme = "qpm";
        designChanged();
    });
    $("dispersion").addEventListener("change", (e) => {
        state.dispersion = e.target.value;
        writeAddress();
        schedule(0);
    });
    for (const r of document.querySelectorAll("input[name=scheme], input[name=process]"))
        r.addEventListener("change", (e) => {
            state[e.target.name] = e.target.value;
            designChanged();
        });
    for (const k of ["pump", "idler", "fundamental", "type"])
        $(k).addEventListener("change", (e) => {
            state[k] = e.target.value.trim();
            designChanged();
        });
    for (const k of ["temp", "period", "theta", "length"]) {
        $(k).addEventListener("input", (e) => {
            state[k] = e.target.value;
            showSliders();
            writeAddress();
            schedule(120);
        });
        $(k).addEventListener("change", () => schedule(0));
    }
    $("tune-x").addEventListener("change", (e) => {
        state.tune = e.target.value;
        writeAddress();
        schedule(0);
    });
    $("to-design").addEventListener("click", (e) => {
        const v = e.target.dataset.value;
        if (!v)
            return;
        state[state.scheme === "qpm" ? "period" : "theta"] = v;
        applyState();
        schedule(0);
    });
    for (const box of document.querySelectorAll(".save-figure"))
        for (const b of box.querySelectorAll("button"))
            b.addEventListener("click", () =>
                saveFigure(box.dataset.figure, b.dataset.format));
    $("save-design").addEventListener("click", () =>
        download(new Blob([designFile()], {type: "text/plain"}),
                 "design.dk"));
    window.addEventListener("hashchange", () => {
        readAddress();
        applyState();
        schedule(0);
    });
}

async function start() {
    readAddress();
    const r = await getJson(call("crystals", []), new AbortController().signal);
    if (!r.data) {
        $("status").textContent = "error: " + r.error;
        return;
    }
    crystals = r.data.crystals;
    $("crystal").replaceChildren(...crystals.map((c) => {
        const o = document.createElement("option");
        o.value = c.crystal;
        o.textContent = c.crystal + (c.name ? " – " + c.name : "");
        return o;
    }));
    bind();
    applyState();
    update();
}

start();
