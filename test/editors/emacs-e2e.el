;;; emacs-e2e.el --- Emacs + eglot end-to-end check of the Cellrun language server  -*- lexical-binding: t -*-
;; Usage: CELLRUN_SERVER=dist/server.js CELLRUN_FILE=x.cellrun emacs --batch --no-init-file -l test/editors/emacs-e2e.el
;; Prints one result per line: DIAG line:col code | HINT line:col label | COMPLETION n first | FORMAT n | DONE
(require 'package)
(package-initialize)
(require 'eglot)
(require 'flymake)
(define-derived-mode cellrun-mode prog-mode "Cellrun")
(add-to-list 'auto-mode-alist '("\\.cellrun\\'" . cellrun-mode))
(add-to-list 'eglot-server-programs `(cellrun-mode . ("node" ,(getenv "CELLRUN_SERVER") "--stdio")))
(defun e2e-out (fmt &rest args) (princ (concat (apply #'format fmt args) "\n")))
(find-file (getenv "CELLRUN_FILE"))
(setq eglot-sync-connect 10)
;; Start eglot for this buffer in a transient project (the file may be outside any repository).
(eglot (list 'cellrun-mode) (cons 'transient (file-name-directory (buffer-file-name))) 'eglot-lsp-server
       (list "node" (getenv "CELLRUN_SERVER") "--stdio") "cellrun")
(let ((deadline (+ (float-time) 20)))
  (while (and (not (eglot-current-server)) (< (float-time) deadline)) (accept-process-output nil 0.1)))
(flymake-mode 1)
(let ((deadline (+ (float-time) 20)))
  (while (and (null (flymake-diagnostics)) (< (float-time) deadline))
    (flymake-start)
    (accept-process-output nil 0.2)))
(dolist (d (flymake-diagnostics))
  (save-excursion
    (goto-char (flymake-diagnostic-beg d))
    (e2e-out "DIAG %d:%d %s" (line-number-at-pos) (1+ (current-column))
             (let ((m (flymake-diagnostic-text d))) (if (string-match "\\[\\([a-z0-9-]+\\)\\]" m) (match-string 1 m) m)))))
(let* ((server (eglot-current-server))
       (uri (eglot--path-to-uri (buffer-file-name)))
       (hints (jsonrpc-request server :textDocument/inlayHint
                               `(:textDocument (:uri ,uri) :range (:start (:line 0 :character 0) :end (:line ,(count-lines (point-min) (point-max)) :character 0))))))
  (seq-doseq (h hints)
    (let ((pos (plist-get h :position)))
      (e2e-out "HINT %d:%d %s" (1+ (plist-get pos :line)) (plist-get pos :character) (plist-get h :label))))
  (goto-char (point-max))
  (unless (bolp) (insert "\n"))
  (eglot--signal-textDocument/didChange)
  (condition-case err
      (let* ((comp (jsonrpc-request server :textDocument/completion
                                    `(:textDocument (:uri ,uri) :position (:line ,(1- (line-number-at-pos)) :character 0))))
             (items (if (vectorp comp) comp (plist-get comp :items))))
        (e2e-out "COMPLETION %d %s" (length items) (if (> (length items) 0) (plist-get (aref items 0) :label) "")))
    (error (e2e-out "COMPLETION -1 %S" err)))
  (condition-case err
      (let ((edits (jsonrpc-request server :textDocument/formatting
                                    `(:textDocument (:uri ,uri) :options (:tabSize 2 :insertSpaces t)))))
        (e2e-out "FORMAT %d" (length edits)))
    (error (e2e-out "FORMAT -1 %S" err))))
(e2e-out "DONE")
(kill-emacs 0)
