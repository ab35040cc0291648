"""Tests of flowsolve_calc_client (the HTTP side of the Calc functions) with plain python3 and a local HTTP server.

Run: python3 -m unittest discover -s clients/libreoffice/tests -p 'test_*.py' (CalcExtensionTests runs it too, with
FLOWSOLVE_EXPECTED_KEY_HEADER set to the header the service reads its API key from).
"""

import http.server
import os
import random
import re
import struct
import sys
import threading
import unittest
import urllib.parse

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "extension", "pythonpath"))

import flowsolve_calc_client as client  # noqa: E402

# The service's number grammar (StrictQuery.IsInvariantNumber): digits, at most one point, an optional exponent.
SERVICE_NUMBER = re.compile(r"^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$")


class FakeClock:
    def __init__(self):
        self.now = 1000.0

    def __call__(self):
        return self.now


class Stub(http.server.BaseHTTPRequestHandler):
    """Answers GET /v1/... from the test's script: each path maps to (status, headers, body); If-None-Match that
    equals the answer's ETag gets a 304 with the same headers. Every request is recorded."""

    answers = {}
    requests = []

    def do_GET(self):
        path = urllib.parse.urlsplit(self.path).path
        Stub.requests.append((path, dict(self.headers)))
        status, headers, body = Stub.answers.get(path, (404, {}, '{"title":"Not Found","detail":"no such route"}'))
        if status == 200 and headers.get("ETag") and self.headers.get("If-None-Match") == headers["ETag"]:
            status, body = 304, ""
        data = body.encode("utf-8")
        self.send_response(status)
        for name, value in headers.items():
            self.send_header(name, value)
        if status != 304:
            self.send_header("Content-Type", "text/plain; charset=utf-8")
            self.send_header("Content-Length", str(len(data)))
        self.end_headers()
        if status != 304:
            self.wfile.write(data)

    def log_message(self, *args):
        pass


class ServerTestCase(unittest.TestCase):
    @classmethod
    def setUpClass(cls):
        cls.server = http.server.ThreadingHTTPServer(("127.0.0.1", 0), Stub)
        cls.base = "http://127.0.0.1:%d" % cls.server.server_address[1]
        cls.thread = threading.Thread(target=cls.server.serve_forever, daemon=True)
        cls.thread.start()

    @classmethod
    def tearDownClass(cls):
        cls.server.shutdown()
        cls.server.server_close()

    def setUp(self):
        Stub.answers = {}
        Stub.requests = []
        self.clock = FakeClock()
        self.client = client.Client(clock=self.clock, window=2.0, timeout=10)

    def sent(self, path):
        return [headers for p, headers in Stub.requests if p == path]


class NumberFormatTests(unittest.TestCase):
    def test_every_double_reads_back_exactly_in_the_service_grammar(self):
        rng = random.Random(20240611)
        samples = [0.12, 0.1 + 0.2, 1 / 3, 2350.0, 75000.0, -2400.0, 0.0005, 1.5e-5, 1e20, 1e-300, 5e-324,
                   1.7976931348623157e308, 2.0 ** 53, 2.0 ** 53 + 2, -0.0, 12.0]
        samples += [struct.unpack("<d", struct.pack("<Q", rng.getrandbits(64)))[0] for _ in range(4000)]
        samples += [rng.uniform(-1e6, 1e6) for _ in range(2000)]
        for x in samples:
            if x != x or x in (float("inf"), float("-inf")):
                continue
            text = client.format_value(x)
            self.assertRegex(text, SERVICE_NUMBER, repr(x))
            self.assertEqual(float(text), x, text)
            self.assertLessEqual(len(text), len(repr(x)), "not the shortest text for %r" % x)

    def test_whole_numbers_have_no_point(self):
        self.assertEqual(client.format_value(75000.0), "75000")
        self.assertEqual(client.format_value(-2400.0), "-2400")
        self.assertEqual(client.format_value(-0.0), "0")
        self.assertEqual(client.format_value(7), "7")

    def test_non_finite_and_other_types_are_refused(self):
        for bad in (float("nan"), float("inf"), float("-inf"), None, True, object()):
            with self.assertRaises(client.ArgumentError):
                client.format_value(bad)

    def test_text_passes_unchanged(self):
        self.assertEqual(client.format_value("0,12"), "0,12")


class UrlTests(unittest.TestCase):
    def test_names_and_values_are_url_encoded_and_read_back(self):
        pairs = ["fittings", "elbow-90-flanged-long-radius:8,gate-valve-open:2", "reynolds", 1e20, "note", "a b+c&d=e/f",
                 "flow", 0.12, "material", "caf\u00e9"]
        url = client.build_url("http://host:5080/", "/v1/pipes/head-loss", client.pairs_to_query(pairs), "totalHead")
        parts = urllib.parse.urlsplit(url)
        self.assertEqual(parts.path, "/v1/pipes/head-loss")
        self.assertNotIn("+", parts.query)
        self.assertNotIn(" ", parts.query)
        self.assertEqual(urllib.parse.parse_qsl(parts.query, keep_blank_values=True, strict_parsing=True),
                         [("fittings", "elbow-90-flanged-long-radius:8,gate-valve-open:2"), ("reynolds", "1e+20"),
                          ("note", "a b+c&d=e/f"), ("flow", "0.12"), ("material", "caf\u00e9"),
                          ("format", "text"), ("select", "totalHead")])

    def test_no_output_means_no_select(self):
        url = client.build_url("http://h", "friction-factor", [("reynolds", "75000")], "")
        self.assertEqual(url, "http://h/v1/friction-factor?reynolds=75000&format=text")

    def test_malformed_calls_are_refused(self):
        with self.assertRaises(client.ArgumentError):
            client.pairs_to_query(["flow"])  # a name without a value
        with self.assertRaises(client.ArgumentError):
            client.pairs_to_query(["n%d" % i if i % 2 == 0 else 1.0 for i in range(2 * client.MAX_PAIRS + 2)])
        with self.assertRaises(client.ArgumentError):
            client.pairs_to_query([12.0, 1.0])  # a number where a name belongs
        with self.assertRaises(client.ArgumentError):
            client.pairs_to_query(["flow", ((0.1,), (0.2,))])  # a range of two cells
        with self.assertRaises(client.ArgumentError):
            client.build_url("http://h", "  ", [], None)

    def test_twelve_pairs_a_one_cell_range_and_an_empty_name(self):
        twelve = []
        for i in range(client.MAX_PAIRS):
            twelve += ["n%d" % i, float(i)]
        self.assertEqual(len(client.pairs_to_query(twelve)), 12)
        self.assertEqual(client.pairs_to_query(["flow", ((0.12,),), "", 5.0]), [("flow", "0.12")])


class SettingTests(unittest.TestCase):
    def test_environment_then_setting_then_default(self):
        self.assertEqual(client.first_setting("http://env", "http://setting", client.DEFAULT_URL), "http://env")
        self.assertEqual(client.first_setting(None, "http://setting", client.DEFAULT_URL), "http://setting")
        self.assertEqual(client.first_setting("  ", "", client.DEFAULT_URL), "http://localhost:5080")
        self.assertIsNone(client.first_setting(None, None, None))


class AnswerTests(unittest.TestCase):
    def test_numbers_become_doubles_and_texts_stay_texts(self):
        self.assertEqual(client.read_answer("0.03160291527496281"), 0.03160291527496281)
        self.assertEqual(client.read_answer("1.5E-05"), 1.5e-05)
        self.assertEqual(client.read_answer("DN 280"), "DN 280")
        self.assertEqual(client.read_answer(""), "")

    def test_error_lines(self):
        self.assertEqual(client.error_line(400, "error: flow: '0,12' holds a comma\n", "http://h"), "error: flow: '0,12' holds a comma")
        self.assertEqual(client.error_line(404, '{"title":"Not Found","detail":"There is no resource at this path."}', "http://h"),
                         "error: http 404: There is no resource at this path.")
        self.assertEqual(client.error_line(0, "Connection refused", "http://h"), "error: service: cannot reach http://h (Connection refused)")


class CachingTests(ServerTestCase):
    def test_identical_calls_within_the_window_are_asked_once(self):
        Stub.answers["/v1/a"] = (200, {}, "1.5\n")
        url = self.base + "/v1/a?x=1&format=text"
        answers = [self.client.get(url) for _ in range(5)]
        self.assertEqual([a.body for a in answers], ["1.5"] * 5)
        self.assertEqual(len(self.sent("/v1/a")), 1)
        self.clock.now += 2.5  # the next recalculation asks again (no ETag, no max-age: nothing kept)
        self.client.get(url)
        self.assertEqual(len(self.sent("/v1/a")), 2)
        self.assertNotIn("If-None-Match", self.sent("/v1/a")[1])

    def test_errors_are_answers_too_and_are_not_kept_past_the_window(self):
        Stub.answers["/v1/bad"] = (400, {"ETag": '"e"', "Cache-Control": "max-age=60"}, "error: flow: is required\n")
        url = self.base + "/v1/bad?format=text"
        first = self.client.get(url)
        self.assertEqual((first.status, first.ok, first.body), (400, False, "error: flow: is required"))
        self.client.get(url)
        self.assertEqual(len(self.sent("/v1/bad")), 1)
        self.clock.now += 3
        self.client.get(url)
        self.assertEqual(len(self.sent("/v1/bad")), 2)
        self.assertNotIn("If-None-Match", self.sent("/v1/bad")[1])

    def test_fresh_answers_are_reused_and_then_revalidated_with_their_etag(self):
        Stub.answers["/v1/b"] = (200, {"ETag": '"v1"', "Cache-Control": "public, max-age=60"}, "0.25\n")
        url = self.base + "/v1/b?format=text"
        self.assertEqual(self.client.get(url).body, "0.25")
        self.clock.now += 30  # past the window, within max-age: no request
        self.assertEqual(self.client.get(url).body, "0.25")
        self.assertEqual(len(self.sent("/v1/b")), 1)
        self.clock.now += 31  # stale: revalidated, the server answers 304 and the kept body is used
        again = self.client.get(url)
        self.assertEqual((again.status, again.body), (200, "0.25"))
        requests = self.sent("/v1/b")
        self.assertEqual(len(requests), 2)
        self.assertEqual(requests[1].get("If-None-Match"), '"v1"')
        self.clock.now += 30  # the 304's max-age made it fresh again
        self.client.get(url)
        self.assertEqual(len(self.sent("/v1/b")), 2)

    def test_a_changed_answer_replaces_the_kept_one(self):
        Stub.answers["/v1/c"] = (200, {"ETag": '"v1"'}, "1\n")
        url = self.base + "/v1/c?format=text"
        self.client.get(url)
        Stub.answers["/v1/c"] = (200, {"ETag": '"v2"'}, "2\n")
        self.clock.now += 3
        self.assertEqual(self.client.get(url).body, "2")
        self.assertEqual(self.sent("/v1/c")[1].get("If-None-Match"), '"v1"')
        self.clock.now += 3
        self.assertEqual(self.client.get(url).body, "2")  # 304 against v2
        self.assertEqual(self.sent("/v1/c")[2].get("If-None-Match"), '"v2"')

    def test_no_store_keeps_nothing(self):
        Stub.answers["/v1/d"] = (200, {"ETag": '"v1"', "Cache-Control": "no-store"}, "3\n")
        url = self.base + "/v1/d?format=text"
        self.client.get(url)
        self.clock.now += 3
        self.client.get(url)
        self.assertNotIn("If-None-Match", self.sent("/v1/d")[1])

    def test_the_api_key_goes_in_the_services_header(self):
        header = os.environ.get("FLOWSOLVE_EXPECTED_KEY_HEADER", "X-Api-Key")
        Stub.answers["/v1/k"] = (200, {}, "4\n")
        self.client.get(self.base + "/v1/k?format=text", "s3cret")
        self.client.get(self.base + "/v1/k?format=text&other=1")
        with_key, without = self.sent("/v1/k")
        self.assertEqual({k.lower(): v for k, v in with_key.items()}.get(header.lower()), "s3cret")
        self.assertNotIn(header.lower(), {k.lower() for k in without})

    def test_an_unreachable_service_is_status_zero(self):
        server = http.server.HTTPServer(("127.0.0.1", 0), Stub)
        port = server.server_address[1]
        server.server_close()  # nobody listens there now
        answer = self.client.get("http://127.0.0.1:%d/v1/x?format=text" % port)
        self.assertEqual(answer.status, 0)
        self.assertFalse(answer.ok)


if __name__ == "__main__":
    unittest.main()
