"""A build loads the CAD kernel's OCP modules only: never cadquery (and with it vtk), whose
import costs seconds and hundreds of MiB (issue 13). cadquery stays for the Python API
(``gen.api.to_cadquery``). One small spur gear built by the command line in a fresh process."""

import subprocess
import sys

from conftest import ROOT

GEAR = """parts:
  tiny_spur:
    kind: spur_gear
    module: 1
    teeth: 12
    face_width: 3
    bore: 3
    chord_tolerance: 0.05
"""

CODE = """
import sys
from gen.cli import main
rc = main(['build', {yaml!r}, '--out', {out!r}, '--format', 'step,stl', '--jobs', '1'])
loaded = sorted({{m.split('.')[0] for m in sys.modules}})
print('RESULT', rc, [m for m in loaded if m == 'cadquery' or m.startswith('vtk')],
      'OCP' in loaded)
"""


def test_build_imports_ocp_but_not_cadquery(tmp_path):
    yaml = tmp_path / "tiny.yaml"
    yaml.write_text(GEAR)
    out = tmp_path / "out"
    r = subprocess.run([sys.executable, "-c", CODE.format(yaml=str(yaml), out=str(out))],
                       capture_output=True, text=True, cwd=ROOT, timeout=300)
    last = [ln for ln in r.stdout.splitlines() if ln.startswith("RESULT")]
    assert last == ["RESULT 0 [] True"], r.stdout[-2000:] + r.stderr[-2000:]
    assert (out / "tiny_spur.step").stat().st_size > 0 and (out / "tiny_spur.stl").exists()
    # the kernel's STEP writer and reader print transfer statistics unless silenced
    assert "Statistics on Transfer" not in r.stdout and "WorkSession" not in r.stdout


def test_to_cadquery_still_gives_a_cadquery_solid():
    import cadquery as cq

    from gen import api

    g = api.make("spur_gear", "tiny", module=1, teeth=12, face_width=3, bore=3)
    s = api.to_cadquery(g)
    assert isinstance(s, cq.Solid) and s.isValid()
    # volume of a 12-tooth m 1 gear, 3 mm wide, less its Ø3 bore, lies between the root-circle
    # and the tip-circle cylinders: d_f = m(z − 2.5), d_a = m(z + 2) (ISO 53 profile A
    # dedendum 1.25 m, addendum m; common practice)
    import math

    bore = math.pi * 1.5 ** 2 * 3
    lo = math.pi * (1 * (12 - 2.5) / 2) ** 2 * 3 - bore
    hi = math.pi * (1 * (12 + 2) / 2) ** 2 * 3 - bore
    assert lo < s.Volume() < hi
