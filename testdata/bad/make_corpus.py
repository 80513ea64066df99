#!/usr/bin/env python3
"""Writes the bad-input corpus of testdata/bad: one small design, stackup or
Touchstone file per fault, and manifest.tsv listing each command line with
its expected exit status and the fragments its message must hold (the file,
the key or flag, and the reason). TestBadInputs in cmd/stubcraft runs them.

Run from testdata/bad: python3 make_corpus.py
"""
import os

BASE = {
    "name": '"beacon"', "frequency": '"915MHz"', "z0": "50", "stackup": '"fr4-1.6mm"',
}
LOAD = {"impedance": '"75+j40"'}
MATCH = {"topology": '"shunt-stub"', "stub": '"short"', "pick": "2"}


def design(top=None, load=None, match=None, extra="", drop=()):
    t = dict(BASE); t.update(top or {})
    l = dict(LOAD); l.update(load or {})
    m = dict(MATCH); m.update(match or {})
    out = []
    for k, v in t.items():
        if k not in drop:
            out.append(f"{k} = {v}")
    out.append("[load]")
    for k, v in l.items():
        if v is not None:
            out.append(f"{k} = {v}")
    if match is not False:
        out.append("[match]")
        for k, v in m.items():
            out.append(f"{k} = {v}")
    return "\n".join(out) + "\n" + extra


rows = []  # (args, exit, fragments)
files = {}


def bad_design(name, text, *frags):
    files[name] = text
    rows.append((f"build {name} -o {{out}}", 1, (name,) + frags))


# frequency
for i, (v, frag) in enumerate([
    ('"1Hz"', "from 1 MHz to 110 GHz"), ('"1THz"', "from 1 MHz to 110 GHz"), ('"1e20Hz"', "from 1 MHz to 110 GHz"),
    ('"1e307Hz"', "from 1 MHz to 110 GHz"), ('"0Hz"', "positive"), ('"-1GHz"', "positive"), ('"2.45"', "unit"),
    ('"2.45 furlongs"', "unknown unit"), ('"100mHz"', 'write "MHz"'), ('"100mhz"', "case-sensitive"),
    ('"NaN GHz"', "not a number"), ('"1e999GHz"', "finite"), ('"111GHz"', "from 1 MHz to 110 GHz"), ("2.45e9", "frequency"),
]):
    bad_design(f"frequency-{i+1:02d}.toml", design(top={"frequency": v}), "frequency", frag)
bad_design("frequency-stackup.toml", design(top={"frequency": '"60GHz"'}), "frequency", "at most")
bad_design("frequency-missing.toml", design(drop=("frequency",)), "frequency")
# z0
for i, (v, frag) in enumerate([("2", "from 10 to 200 ohm"), ("500", "from 10 to 200 ohm"), ('"fifty"', "z0"), ("-50", "from 10 to 200 ohm")]):
    bad_design(f"z0-{i+1}.toml", design(top={"z0": v}), "z0", frag)
# load impedance
for i, (v, frag) in enumerate([
    ('"31-j"', "the j needs a number"), ('"50+j"', "the j needs a number"), ('"-12+j30"', "negative resistance"),
    ('"0-j24"', "--accept-loss"), ('"1e-9+j50"', "--accept-loss"), ('"1e9+j0"', "--accept-loss"),
    ('"1e-6-j1e-6"', "--accept-loss"), ('"0.001+j1000"', "--accept-loss"), ('"1e-300+j50"', "--accept-loss"),
    ('"abc"', "impedance"), ('"1e999"', "finite"), ('""', "impedance"), ('"1+j0"', "dissipate 4.3 dB"), ('"18-k22"', "impedance"),
]):
    bad_design(f"load-{i+1:02d}.toml", design(load={"impedance": v}), "load.impedance", frag)
bad_design("load-none.toml", design(load={"impedance": None}), "load")
# layout, fab, sweep, tolerance
for i, (table, key, v, frag) in enumerate([
    ("layout", "feed_length", '"1e9m"', "at most 500 mm"), ("layout", "feed_length", '"0mm"', "more than 0 mm"),
    ("layout", "feed_length", '"-1mm"', "more than 0 mm"), ("layout", "feed_length", '"1Mm"', "case-sensitive"),
    ("layout", "feed_length", '"5"', "unit"), ("layout", "feed_length", '"5 furlongs"', "unknown unit"),
    ("layout", "margin", '"-1mm"', "from 0 mm to 100 mm"), ("layout", "margin", '"1m"', "from 0 mm to 100 mm"),
    ("layout", "margin", '"2MM"', "case-sensitive"),
    ("layout", "max_board", '["60mm", "0mm"]', "height"), ("layout", "max_board", '["1e6mm", "40mm"]', "width"),
    ("layout", "via_drill", '"0mm"', "from 0.05 mm to 5 mm"), ("layout", "via_drill", '"10mm"', "from 0.05 mm to 5 mm"),
    ("layout", "via_pad", '"0.1mm"', "larger than the drill"), ("layout", "via_pad", '"50mm"', "at most 10 mm"),
    ("layout", "stub_side", '"left"', "up or down"),
    ("fab", "min_width", '"0um"', "from 0.01 mm to 5 mm"), ("fab", "min_width", '"1m"', "from 0.01 mm to 5 mm"),
    ("sweep", "points", "1", "points"), ("sweep", "points", "10000000", "points"),
    ("tolerance", "width", '"-2um"', "from 0 mm to 1 mm"), ("tolerance", "width", '"5mm"', "from 0 mm to 1 mm"),
    ("tolerance", "er", '"150%"', "100%"), ("tolerance", "samples", "-1", "samples"),
    ("tolerance", "samples", "1000000000", "samples"), ("tolerance", "thickness", '"ten%"', "thickness"),
]):
    bad_design(f"{table}-{i+1:02d}.toml", design(extra=f"[{table}]\n{key} = {v}\n"), f"{table}.{key}", frag)
bad_design("sweep-stop.toml", design(extra='[sweep]\nstart = "800MHz"\nstop = "1THz"\n'), "sweep.stop", "220 GHz or below")
bad_design("sweep-start.toml", design(extra='[sweep]\nstart = "0Hz"\nstop = "1GHz"\n'), "sweep.start", "start")
# match
for i, (key, v, frag) in enumerate([
    ("topology", '"triple-stub"', "topolog"), ("stub", '"shorted"', "open or short"), ("pick", "3", "pick"),
    ("stub_z0", "500", "from 10 to 200 ohm"), ("line_z0", "5", "from 10 to 200 ohm"), ("pick", '"longest"', "pick"),
]):
    bad_design(f"match-{i+1}.toml", design(match={key: v}), f"match.{key}", frag)
bad_design("unknown-top.toml", design(top={"frequncy": '"1GHz"'}), "frequncy", "unknown key")
# refusals from the layout itself name the design key that set the size
bad_design("launch-via-pitch.toml", design(extra='[layout]\nport = "edge"\nlaunch_via_pitch = "0.2mm"\n'),
           "layout.launch_via_pitch", "0.2 mm pitch", "would touch")
bad_design("fence-pitch-pad.toml", design(extra='[layout]\nfence_pitch = "2mm"\nvia_drill = "0.3mm"\nvia_pad = "0.31mm"\nfence_offset = "0.1mm"\n'),
           "layout.fence_offset", "half the via pad")
bad_design("unknown-layout.toml", design(extra='[layout]\nfeed_lenght = "5mm"\n'), "layout.feed_lenght", "feed_length")
bad_design("match-array.toml", design(match=False, extra='[[match]]\ntopology = "shunt-stub"\nstub = "short"\n'), "match", "a table, not an array of tables")
bad_design("syntax.toml", design() + 'name = "twice"\n', "name")
bad_design("no-network.toml", design(match=False), "match")
SECTION = '[[section]]\nkind = "line"\nz0 = 50\nlength = "40deg"\n[[section]]\nkind = "stub"\nend = "open"\nz0 = 50\nlength = "60deg"\n'
for i, (old, new, key, frag) in enumerate([
    ('kind = "stub"', 'kind = "capacitor"', "section[2].kind", "line or stub"),
    ('length = "60deg"', 'length = "0deg"', "section[2].length", "positive"),
    ('length = "60deg"', 'length = "800deg"', "section[2].length", "at most 720"),
    ('end = "open"\nz0 = 50', 'end = "open"\nz0 = 250', "section[2].z0", "from 10 to 200 ohm"),
    ('kind = "line"\nz0 = 50', 'kind = "line"\nend = "open"\nz0 = 50', "section[1].end", "only a stub"),
    ('length = "40deg"', 'length = "40"', "section[1].length", "unit"),
]):
    bad_design(f"section-{i+1}.toml", design(match=False, extra=SECTION.replace(old, new, 1)), key, frag)

# stackups, named by a design and by --stackup
STACK = '''name = "board"
[dielectric]
er = 4.4
loss_tangent = 0.02
thickness = "1.6mm"
[copper]
thickness = "35um"
'''
for i, (old, new, key, frag) in enumerate([
    ("er = 4.4", "er = -1", "dielectric.er", "er"), ('thickness = "1.6mm"', 'thickness = "0mm"', "dielectric.thickness", "thickness"),
    ('thickness = "1.6mm"', 'thickness = "1.6Mm"', "dielectric.thickness", "case-sensitive"),
    ("loss_tangent = 0.02", "loss_tangent = 2", "dielectric.loss_tangent", "loss_tangent"),
    ('thickness = "35um"', 'thickness = "35"', "copper.thickness", "unit"), ("er = 4.4", "er = 4.4\nepsilon = 4", "dielectric.epsilon", "unknown"),
    ("er = 4.4", 'er = "4.4x"', "dielectric.er", "er"),
]):
    sname = f"stackup-{i+1}.toml"
    files[sname] = STACK.replace(old, new, 1)
    dname = f"uses-stackup-{i+1}.toml"
    files[dname] = design(top={"stackup": f'"{sname}"'})
    rows.append((f"build {dname} -o {{out}}", 1, (dname, "stackup", sname, key.split(".")[-1], frag)))
    rows.append((f"trace --stackup {sname} --freq 2.45GHz --z0 50", 1, ("--stackup", sname, key.split(".")[-1], frag)))
files["uses-missing-stackup.toml"] = design(top={"stackup": '"missing.toml"'})
rows.append(("build uses-missing-stackup.toml -o {out}", 1, ("uses-missing-stackup.toml", "stackup", "missing.toml")))
files["uses-no-preset.toml"] = design(top={"stackup": '"fr5-9mm"'})
rows.append(("build uses-no-preset.toml -o {out}", 1, ("uses-no-preset.toml", "stackup", "fr5-9mm", "presets")))
files["uses-fifo-stackup.toml"] = design(top={"stackup": '"fifo.toml"'})

# Touchstone loads
def ts_design(name, ts):
    files[name] = design(load={"impedance": None, "touchstone": f'"{ts}"'})

TS = {
    "ts-db.s1p": "# GHz S DB R 50\n0.8 -10 30\n0.9 7000 20\n1 -10 10\n",
    "ts-negative.s1p": "# GHz S MA R 50\n0.8 -0.5 30\n1 0.5 20\n",
    "ts-decreasing.s1p": "# GHz S MA R 50\n0.8 0.5 30\n1 0.5 20\n0.9 0.5 10\n",
    "ts-nodata.s1p": "# GHz S MA R 50\n! nothing\n",
    "ts-nooptions.s1p": "0.8 0.5 30\n1 0.5 20\n",
    "ts-short-range.s1p": "# GHz S MA R 50\n2 0.5 30\n3 0.5 20\n",
    "ts-reflective.s1p": "# GHz S MA R 50\n0.6 1 30\n1.2 1 20\n",
    "ts-hugefreq.s1p": "# GHz S MA R 50\n1e305 0.5 30\n",
    "ts-text.s1p": "# GHz S MA R 50\n0.8 0.5 thirty\n",
    "ts-zparams.s1p": "# GHz Z MA R 50\n0.8 0.5 30\n",
    "ts-two.s2p": "# GHz S MA R 50\n0.8 0.5 30 0.1 0 0.1 0 0.5 30\n",
}
for n, body in TS.items():
    files[n] = body
# ts-long.s1p, a line of 1.1 MB, is written by the test rather than kept here.
frag_ts = {
    "ts-long.s1p": ("ts-long.s1p:3", "longer than"), "ts-db.s1p": ("ts-db.s1p:3", "not a finite"),
    "ts-negative.s1p": ("ts-negative.s1p:2", "negative"), "ts-decreasing.s1p": ("ts-decreasing.s1p:4", "does not increase"),
    "ts-nodata.s1p": ("ts-nodata.s1p", "no data"), "ts-nooptions.s1p": ("ts-nooptions.s1p:1", "option line"),
    "ts-short-range.s1p": ("ts-short-range.s1p", "outside the data"), "ts-reflective.s1p": ("|Γ_load|", "--accept-loss"),
    "ts-hugefreq.s1p": ("ts-hugefreq.s1p:2", "hertz"), "ts-text.s1p": ("ts-text.s1p:2", "thirty"),
    "ts-zparams.s1p": ("ts-zparams.s1p:1", "only S"), "ts-two.s2p": ("ts-two.s2p", "1-port (.s1p)"),
}
for n, fr in frag_ts.items():
    dn = "uses-" + n.replace(".", "-") + ".toml"
    ts_design(dn, n)
    rows.append((f"build {dn} -o {{out}}", 1, (dn, "load.touchstone") + fr))
ts_design("uses-missing-s1p.toml", "missing.s1p")
rows.append(("build uses-missing-s1p.toml -o {out}", 1, ("uses-missing-s1p.toml", "load.touchstone", "missing.s1p")))
ts_design("uses-fifo-s1p.toml", "fifo.s1p")

# files that are not files
rows.append(("build fifo.toml -o {out}", 1, ("fifo.toml", "named pipe")))
rows.append(("build uses-fifo-s1p.toml -o {out}", 1, ("uses-fifo-s1p.toml", "load.touchstone", "named pipe")))
rows.append(("build uses-fifo-stackup.toml -o {out}", 1, ("uses-fifo-stackup.toml", "stackup", "named pipe")))
rows.append(("trace --stackup fifo.toml --freq 2.45GHz --z0 50", 1, ("--stackup", "named pipe")))
rows.append(("build /dev/zero -o {out}", 1, ("/dev/zero", "character device")))
rows.append(("build . -o {out}", 1, (".", "directory")))
rows.append(("build missing.toml -o {out}", 1, ("missing.toml", "no such file")))
files["empty.toml"] = ""
rows.append(("build empty.toml -o {out}", 1, ("empty.toml", "name")))
files["binary.toml"] = "\x00\x01\x02name"
rows.append(("build binary.toml -o {out}", 1, ("binary.toml",)))

# command-line flags
for args, frags in [
    ("trace --stackup fr4-1.6mm --freq 2.45GHz --width 1e-300um", ("--width", "from 0.001 mm")),
    ("trace --stackup fr4-1.6mm --freq 2.45GHz --width 1e300mm --json", ("--width", "from 0.001 mm")),
    ("trace --stackup {testdata}/stackups/gcpw-hydrocarbon.toml --freq 2.45GHz --width 7e22m", ("--width", "from 0.001 mm")),
    ("trace --stackup fr4-1.6mm-masked --freq 2.45GHz --width 1e10m", ("--width", "from 0.001 mm")),
    ("trace --stackup fr4-1.6mm --freq 1Hz --z0 50", ("--freq", "from 1 MHz to 110 GHz")),
    ("trace --stackup fr4-1.6mm --freq 1THz --z0 50", ("--freq", "from 1 MHz to 110 GHz")),
    ("trace --stackup fr4-1.6mm --freq 1mHz --z0 50", ("--freq", "case-sensitive")),
    ("trace --stackup fr4-1.6mm --freq 60GHz --z0 50", ("--freq", "fr4-1.6mm", "at most")),
    ("trace --stackup fr4-1.6mm --freq 2.45GHz --z0 5", ("--z0", "from 10 to 200 ohm")),
    ("trace --stackup fr4-1.6mm --freq 2.45GHz --z0 500", ("--z0", "from 10 to 200 ohm")),
    ("trace --stackup fr4-1.6mm --freq 2.45GHz --z0 50 --length 0deg", ("--length", "more than 0°")),
    ("trace --stackup fr4-1.6mm --freq 2.45GHz --z0 50 --length 1000deg", ("--length", "at most 720°")),
    ("trace --stackup fr4-1.6mm --freq 2.45GHz --width 1Mm", ("--width", "case-sensitive")),
    ("trace --stackup fr4-1.6mm --freq 2.45GHz --z0 50 --width 1mm", ("--z0", "--width")),
    ("trace --stackup fr4-1.6mm --freq 2.45GHz", ("--z0", "--width")),
    ("solve --load 31-j", ("--load", "the j needs a number")),
    ("solve --load 50+j", ("--load", "the j needs a number")),
    ("solve --load 1e9+j0", ("--load", "--accept-loss")),
    ("solve --load 0-j24", ("--load", "--accept-loss")),
    ("solve --load 31-j24 --line-z0 1e308", ("--line-z0", "from 10 to 200 ohm")),
    ("solve --load 31-j24 --z0 0", ("--z0", "positive")),
    ("solve --load 31-j24 --stub-z0 5", ("--stub-z0", "from 10 to 200 ohm")),
    ("solve --load 31-j24 --stub shorted", ("--stub", "open or short")),
    ("solve --load abc", ("--load", "impedance")),
    ("solve --load -5+j3", ("--load", "negative resistance")),
    ("solve", ("--load", "required")),
    ("xsect --geometry gcpw --width 1e10m --gap 0.2mm --height 0.5mm --er 3.5 --copper 35um", ("--width", "dielectric heights")),
    ("xsect --geometry gcpw --width 1mm --gap 1e-9mm --height 0.5mm --er 3.5 --copper 35um", ("--gap", "dielectric heights")),
    ("xsect --geometry gcpw --width 1mm --gap 0.2mm --height 5m --er 3.5 --copper 35um", ("--height", "from 0.001 mm to 100 mm")),
    ("xsect --geometry microstrip --width 1Mm --height 0.5mm --er 3.5", ("--width", "case-sensitive")),
    ("build -o {out} --samples -5", ("--samples", "negative")),
]:
    rows.append((args, 1, frags))

for old in os.listdir("."):
    if old.endswith((".toml", ".s1p", ".s2p")):
        os.remove(old)
for name, text in files.items():
    with open(name, "w", encoding="utf-8") as f:
        f.write(text)
with open("manifest.tsv", "w", encoding="utf-8") as f:
    f.write("# args\texit status\tfragments the message must hold (tab separated); {out} is a fresh directory, {testdata} the testdata directory; the test runs in a copy of this directory holding also the named pipes fifo.toml and fifo.s1p and ts-long.s1p\n")
    for args, code, frags in rows:
        f.write("\t".join([args, str(code)] + list(frags)) + "\n")
print(len(rows), "rows,", len(files), "files")
