"""Independent reading of rendered SVG figures with Python's own XML parser (xml.etree).

Usage: /usr/bin/python3 svg_check.py FILE.svg...  -> JSON {file: {...}}
For each file: whether it parses as XML, the width/height attributes, the viewBox, and the
number of drawn items inside every Vega mark group (<g class="mark-... role-mark NAME">).
"""
import json
import sys
import xml.etree.ElementTree as ET

NS = '{http://www.w3.org/2000/svg}'
out = {}
for path in sys.argv[1:]:
    rec = {'parses': False}
    try:
        root = ET.parse(path).getroot()
    except ET.ParseError as e:
        rec['error'] = str(e)
        out[path] = rec
        continue
    rec['parses'] = True
    rec['width'] = root.get('width')
    rec['height'] = root.get('height')
    rec['viewBox'] = root.get('viewBox')
    marks = {}
    for g in root.iter(NS + 'g'):
        cls = (g.get('class') or '').split()
        if 'role-mark' in cls:
            name = cls[-1]
            marks[name] = marks.get(name, 0) + len([c for c in g if c.tag in (NS + 'path', NS + 'text', NS + 'line', NS + 'rect')])
    rec['marks'] = marks
    rec['texts'] = sorted({''.join(t.itertext()) for t in root.iter(NS + 'text')})
    out[path] = rec
print(json.dumps(out))
