/* The shortlist page: the copy-link button puts the page's full address on the clipboard (the Clipboard API where
   the browser allows it, else the selected text field and the older copy command), and says which happened. */
(function () {
  "use strict";

  var button = document.getElementById("copy-link");
  var field = document.getElementById("share-url");
  var status = document.getElementById("copy-status");
  if (!button || !field) { return; }
  var url = new URL(field.dataset.path, window.location.href).href;
  field.value = url;

  function fallback() {
    field.focus();
    field.select();
    var done = false;
    try { done = document.execCommand("copy"); } catch (error) { done = false; }
    status.textContent = done ? "Link copied." : "Press Ctrl+C (\u2318C) to copy the selected link.";
  }

  button.addEventListener("click", function () {
    if (navigator.clipboard && window.isSecureContext) {
      navigator.clipboard.writeText(url).then(function () {
        status.textContent = "Link copied.";
        document.body.dataset.copied = url;
      }, fallback);
    } else {
      fallback();
    }
  });
  field.addEventListener("focus", function () { field.select(); });
}());
