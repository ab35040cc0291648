"""The HTTP side of the FlowSolve worksheet functions, free of UNO so plain python3 can test it.

A worksheet call becomes ``GET {base}/v1/{calculation}?{name}={value}&...&format=text[&select={output}]``:

* numbers are written in the invariant grammar whatever the document's locale: the shortest text that reads back
  as the same double (Python's repr), integers without a point (75000);
* names and text values are URL-encoded (``:``, ``,``, ``+`` and spaces included);
* identical URLs within a short window (one recalculation) are asked once;
* answers that carry an ETag are kept, reused while fresh (Cache-Control max-age) and then revalidated with
  If-None-Match; a 304 reuses the kept body.
"""

import json
import math
import re
import threading
import time
import urllib.error
import urllib.parse
import urllib.request
from collections import OrderedDict

DEFAULT_URL = "http://localhost:5080"
# The header the service reads its API key from (src/FlowSolve.Api/Hosting/Protection.cs, Protection.ApiKeyHeader).
API_KEY_HEADER = "X-Api-Key"
URL_VARIABLE = "FLOWSOLVE_URL"
API_KEY_VARIABLE = "FLOWSOLVE_API_KEY"
MAX_PAIRS = 12
# Identical calls within this many seconds share one answer: long enough for one recalculation of a sheet, short
# enough that a later recalculation asks again (and revalidates what it keeps).
RECALC_WINDOW_SECONDS = 2.0
MAX_KEPT_ANSWERS = 2048
TIMEOUT_SECONDS = 30.0

# The service's number grammar: digits, at most one point, an optional exponent.
_NUMBER = re.compile(r"^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$")
_MAX_AGE = re.compile(r"(?:^|,)\s*max-age\s*=\s*\"?(\d+)\"?\s*(?:,|$)", re.IGNORECASE)


class ArgumentError(ValueError):
    """The worksheet call itself is malformed (odd pairs, too many pairs, a name that is not text, a range)."""


def format_value(value):
    """A cell's value as it goes into the query: text as it is, a number in the invariant grammar."""
    if isinstance(value, str):
        return value
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise ArgumentError("a value must be a number or a text, not %s" % type(value).__name__)
    number = float(value)
    if not math.isfinite(number):
        raise ArgumentError("a value must be a finite number")
    if number.is_integer() and abs(number) < 2.0 ** 53:
        return str(int(number))  # 75000, not 75000.0; -0.0 becomes 0
    return repr(number)  # the shortest round-trip text: 0.12, 1.5e-05, 1e+20


def single_value(value):
    """A value that Calc passed as a 1x1 range becomes its element; a larger range is refused."""
    if isinstance(value, (tuple, list)):
        cells = [cell for row in value for cell in (row if isinstance(row, (tuple, list)) else (row,))]
        if len(cells) != 1:
            raise ArgumentError("each value must be one cell, not a range of %d" % len(cells))
        return cells[0]
    return value


def pairs_to_query(pairs):
    """The worksheet's name/value arguments as (name, text) pairs. A pair whose name is empty text is left out."""
    pairs = [single_value(p) for p in pairs]
    if len(pairs) % 2 != 0:
        raise ArgumentError("names and values come in pairs: %d arguments after the output" % len(pairs))
    if len(pairs) > 2 * MAX_PAIRS:
        raise ArgumentError("at most %d name/value pairs" % MAX_PAIRS)
    query = []
    for i in range(0, len(pairs), 2):
        name, value = pairs[i], pairs[i + 1]
        if not isinstance(name, str):
            raise ArgumentError("argument %d must be a parameter name (text)" % (i + 3))
        name = name.strip()
        if name:
            query.append((name, format_value(value)))
    return query


def build_url(base, calculation, query, select=None):
    """GET {base}/v1/{calculation}?{query}&format=text[&select=...], every name and value URL-encoded."""
    path = (calculation or "").strip().strip("/")
    if path.startswith("v1/"):
        path = path[3:]
    if not path:
        raise ArgumentError("the calculation is empty (e.g. pipes/head-loss)")
    parts = ["%s=%s" % (_quote(name), _quote(value)) for name, value in query]
    parts.append("format=text")
    if select:
        parts.append("select=" + _quote(select.strip()))
    return "%s/v1/%s?%s" % (base.rstrip("/"), urllib.parse.quote(path, safe="/-._~"), "&".join(parts))


def _quote(text):
    return urllib.parse.quote(text, safe="-._~")


def first_setting(*candidates):
    """The first candidate that is set and not blank (environment variable, the extension's setting, default)."""
    for candidate in candidates:
        if candidate is not None and str(candidate).strip():
            return str(candidate).strip()
    return None


def read_answer(body):
    """A text answer as a worksheet value: a number when it is one in the service's grammar, else the text."""
    if _NUMBER.match(body):
        return float(body)
    return body


def error_line(status, body, base):
    """The one-line message of a failed call: the service's own 'error: ...' line when it sent one."""
    text = (body or "").strip()
    if status == 0:
        return "error: service: cannot reach %s (%s)" % (base, text or "no answer")
    if text.startswith("error: "):
        return text.splitlines()[0]
    # An answer written before the calculation ran (a problem document, e.g. a missing API key) carries its detail.
    try:
        problem = json.loads(text)
        text = problem.get("detail") or problem.get("title") or text
    except (ValueError, AttributeError):
        pass
    first = text.splitlines()[0] if text else ""
    return ("error: http %d: %s" % (status, first)).rstrip(": ")


class Answer:
    """One answer: HTTP status (0 when the service could not be reached) and the text body."""

    __slots__ = ("status", "body")

    def __init__(self, status, body):
        self.status = status
        self.body = body

    @property
    def ok(self):
        return 200 <= self.status < 300


class _Kept:
    """What is kept of a 200 answer for HTTP caching: its body, ETag and how long it stays fresh."""

    __slots__ = ("body", "etag", "fresh_until")

    def __init__(self, body, etag, fresh_until):
        self.body = body
        self.etag = etag
        self.fresh_until = fresh_until


class Client:
    """GETs with the recalculation window and HTTP caching. Safe to share between threads."""

    def __init__(self, clock=time.monotonic, window=RECALC_WINDOW_SECONDS, timeout=TIMEOUT_SECONDS):
        self._clock = clock
        self._window = window
        self._timeout = timeout
        self._lock = threading.Lock()
        self._recent = OrderedDict()  # url -> (time asked, Answer)
        self._kept = OrderedDict()  # url -> _Kept
        self._opener = urllib.request.build_opener(urllib.request.ProxyHandler({}))
        self.requests_sent = 0

    def get(self, url, api_key=None):
        now = self._clock()
        with self._lock:
            recent = self._recent.get(url)
            if recent is not None and now - recent[0] < self._window:
                return recent[1]
            kept = self._kept.get(url)
            if kept is not None and now < kept.fresh_until:
                return self._remember(url, now, Answer(200, kept.body))

        headers = {"Accept": "text/plain"}
        if api_key:
            headers[API_KEY_HEADER] = api_key
        if kept is not None and kept.etag:
            headers["If-None-Match"] = kept.etag
        status, body, response_headers = self._send(url, headers)

        with self._lock:
            self.requests_sent += 1
            now = self._clock()
            if status == 304 and kept is not None:
                kept.fresh_until = now + _max_age(response_headers)
                kept.etag = response_headers.get("ETag") or kept.etag
                self._kept[url] = kept
                self._kept.move_to_end(url)
                return self._remember(url, now, Answer(200, kept.body))
            if status == 200:
                self._keep(url, now, body, response_headers)
            return self._remember(url, now, Answer(status, body))

    def _send(self, url, headers):
        request = urllib.request.Request(url, headers=headers, method="GET")
        try:
            with self._opener.open(request, timeout=self._timeout) as response:
                return response.status, _text(response.read()), response.headers
        except urllib.error.HTTPError as e:  # 304 and every 4xx or 5xx
            try:
                body = _text(e.read())
            except OSError:
                body = ""
            return e.code, body, e.headers
        except (urllib.error.URLError, OSError) as e:
            return 0, str(getattr(e, "reason", e)), {}

    def _keep(self, url, now, body, headers):
        control = (headers.get("Cache-Control") or "").lower()
        etag = headers.get("ETag")
        if "no-store" in control:
            self._kept.pop(url, None)
            return
        fresh_until = now + (0 if "no-cache" in control else _max_age(headers))
        if not etag and fresh_until <= now:
            self._kept.pop(url, None)
            return
        self._kept[url] = _Kept(body, etag, fresh_until)
        self._kept.move_to_end(url)
        while len(self._kept) > MAX_KEPT_ANSWERS:
            self._kept.popitem(last=False)

    def _remember(self, url, now, answer):
        self._recent[url] = (now, answer)
        self._recent.move_to_end(url)
        while self._recent and (len(self._recent) > MAX_KEPT_ANSWERS or now - next(iter(self._recent.values()))[0] >= self._window):
            self._recent.popitem(last=False)
        return answer


def _max_age(headers):
    control = headers.get("Cache-Control") if headers else None
    if not control or "no-cache" in control.lower():
        return 0
    match = _MAX_AGE.search(control)
    return int(match.group(1)) if match else 0


def _text(data):
    return data.decode("utf-8", errors="replace").strip("\r\n")
