"""FlowSolve worksheet functions for LibreOffice Calc (a Calc add-in in Python-UNO).

FLOWSOLVE(calculation; output; name1; value1; ...) asks a FlowSolve service for one value and returns the number (or
the text, for text outputs); a 4xx answer is an invalid-argument error in the cell (Err:502), a 5xx answer or an
unreachable service #VALUE!. FLOWSOLVE_WARNINGS(calculation; name1; value1; ...) returns the same call's warning
codes, comma-separated (empty when none), or the one-line message of a failed call ("error: field: message").

The service address is FLOWSOLVE_URL when set, else this extension's setting
(/org.flowsolve.calc.Settings/Service/Url), else http://localhost:5080; the API key likewise (FLOWSOLVE_API_KEY,
then .../ApiKey). The interface is idl/XFunctions.idl; the function wizard's texts are in registry/CalcAddIns.xcu.
"""

import os

import unohelper
from com.sun.star.beans import PropertyValue
from com.sun.star.lang import IllegalArgumentException, XServiceInfo, XServiceName
from com.sun.star.uno import RuntimeException
from org.flowsolve.calc import XFunctions

import flowsolve_calc_client as client

IMPLEMENTATION_NAME = "org.flowsolve.calc.Functions"
SERVICE_NAMES = ("com.sun.star.sheet.AddIn",)
SETTINGS_PATH = "/org.flowsolve.calc.Settings/Service"

# One client per office process: its caches outlive a single call (that is their point).
_CLIENT = client.Client()


class Functions(unohelper.Base, XFunctions, XServiceName, XServiceInfo):
    def __init__(self, ctx):
        self._ctx = ctx
        self._settings = None

    # XFunctions: the worksheet functions ------------------------------------------------------------------------

    def flowsolve(self, calculation, output, pairs):
        try:
            url = self._url(calculation, pairs, output)
        except client.ArgumentError as e:
            raise IllegalArgumentException(str(e), self, 0)
        answer = _CLIENT.get(url, self._setting(client.API_KEY_VARIABLE, "ApiKey", None))
        if answer.ok:
            return client.read_answer(answer.body)
        message = client.error_line(answer.status, answer.body, self._base())
        if 400 <= answer.status < 500:
            raise IllegalArgumentException(message, self, 0)
        raise RuntimeException(message, self)

    def flowsolveWarnings(self, calculation, pairs):
        try:
            url = self._url(calculation, pairs, "warnings")
        except client.ArgumentError as e:
            return "error: arguments: %s" % e
        answer = _CLIENT.get(url, self._setting(client.API_KEY_VARIABLE, "ApiKey", None))
        if answer.ok:
            return answer.body
        return client.error_line(answer.status, answer.body, self._base())

    # Settings ------------------------------------------------------------------------------------------------

    def _url(self, calculation, pairs, select):
        return client.build_url(self._base(), calculation, client.pairs_to_query(pairs), select)

    def _base(self):
        return self._setting(client.URL_VARIABLE, "Url", client.DEFAULT_URL)

    def _setting(self, variable, name, default):
        return client.first_setting(os.environ.get(variable), self._configured(name), default)

    def _configured(self, name):
        try:
            if self._settings is None:
                provider = self._ctx.ServiceManager.createInstanceWithContext(
                    "com.sun.star.configuration.ConfigurationProvider", self._ctx)
                path = PropertyValue()
                path.Name = "nodepath"
                path.Value = SETTINGS_PATH
                self._settings = provider.createInstanceWithArguments(
                    "com.sun.star.configuration.ConfigurationAccess", (path,))
            return self._settings.getPropertyValue(name)
        except Exception:  # no settings node (e.g. a broken install): the environment and the default still work
            return None

    # XServiceName, XServiceInfo ------------------------------------------------------------------------------

    def getServiceName(self):
        return IMPLEMENTATION_NAME

    def getImplementationName(self):
        return IMPLEMENTATION_NAME

    def supportsService(self, name):
        return name in SERVICE_NAMES or name == IMPLEMENTATION_NAME

    def getSupportedServiceNames(self):
        return SERVICE_NAMES


g_ImplementationHelper = unohelper.ImplementationHelper()
g_ImplementationHelper.addImplementation(Functions, IMPLEMENTATION_NAME, SERVICE_NAMES + (IMPLEMENTATION_NAME,))
